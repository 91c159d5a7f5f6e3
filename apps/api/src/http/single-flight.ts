/**
 * Requests for the same expensive answer that arrive while it is being computed share that one
 * computation instead of each starting their own: under many readers of the same report, the work per
 * report stays one computation at a time, and every reader still gets an answer computed after their
 * request arrived. Nothing is kept once the computation settles (this is not a cache).
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
