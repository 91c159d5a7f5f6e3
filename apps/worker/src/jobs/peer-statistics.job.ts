import { drainPeerStatisticsUntilIdle, type Database } from '@plumbline/db';

export type PeerStatisticsDrainer = {
  /** Asks for a recompute of everything requested so far; returns at once. */
  kick(): void;
  /** Resolves when this process has no recompute running or asked for. */
  idle(): Promise<void>;
};

/**
 * Recomputes requested peer statistics in the background of the worker process, outside the ingest
 * jobs: uploads that arrive while a recompute runs are folded into the next pass, so a burst of 500
 * uploads costs a handful of recomputes, not 500. Across processes a PostgreSQL advisory lock lets one
 * drain at a time; a request is never left behind (see drainPeerStatisticsUntilIdle).
 */
export function createPeerStatisticsDrainer(
  db: Database,
  settings: { minLabs: number },
  log: (message: string) => void = () => {},
): PeerStatisticsDrainer {
  let running: Promise<void> | null = null;
  let again = false;

  const run = async () => {
    do {
      again = false;
      try {
        const started = performance.now();
        await drainPeerStatisticsUntilIdle(db, settings);
        log(`peer statistics: recomputed in ${Math.round(performance.now() - started)} ms`);
      } catch (error) {
        // The requests stay in PostgreSQL; the next kick or the recovery sweep retries them.
        log(`peer statistics: recompute failed: ${(error as Error).message}`);
      }
    } while (again);
    running = null;
  };

  return {
    kick() {
      if (running) {
        again = true;
        return;
      }
      running = run();
    },
    async idle() {
      while (running) await running;
    },
  };
}
