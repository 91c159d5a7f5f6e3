/**
 * Requests for the same expensive answer that arrive while it is being computed share that one
 * computation instead of each starting their own: under many readers of the same report, the work per
 * report stays one computation at a time. A reader gets an answer that was being computed when their
 * request arrived, never one kept from earlier: nothing is kept once the computation settles (this is
 * not a cache).
 */
export function createSingleFlight<T>() {
  const inFlight = new Map<string, Promise<T>>();
  return function run(key: string, compute: () => Promise<T>): Promise<T> {
    const running = inFlight.get(key);
    if (running) return running;
    const started = compute().finally(() => inFlight.delete(key));
    inFlight.set(key, started);
    return started;
  };
}
