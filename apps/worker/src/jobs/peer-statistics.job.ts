import { drainPeerStatisticsUntilIdle, type Database } from '@plumbline/db';

export type PeerStatisticsDrainer = {
  /** Asks for a recompute of everything requested so far; returns at once. */
  kick(): void;
  /** Resolves when this process has no recompute running or asked for. */
  idle(): Promise<void>;
};

export type DrainerOptions = {
  minLabs: number;
  /** Wait this long after a kick before recomputing, so uploads arriving together share one pass. */
  delayMs: number;
  /** While this process is busy ingesting, put the recompute off, but never longer than this. */
  maxWaitMs: number;
  /** True while ingest jobs are running in this process. */
  busy: () => boolean;
};

/**
 * Recomputes requested peer statistics in the background of the worker process, outside the ingest
 * jobs. A recompute covers every group an upload touched, which in a large network is most of it, so
 * uploads arriving in a burst are folded together: the recompute waits `delayMs`, and while ingest jobs
 * keep running it waits for a quiet moment, at most `maxWaitMs`. Across processes a PostgreSQL advisory
 * lock lets one recompute run at a time, and no request is ever left behind
 * (see drainPeerStatisticsUntilIdle). The requests themselves live in PostgreSQL, so a crash loses none.
 */
export function createPeerStatisticsDrainer(
  db: Database,
  options: DrainerOptions,
  log: (message: string) => void = () => {},
): PeerStatisticsDrainer {
  let timer: NodeJS.Timeout | null = null;
  let firstKick = 0;
  let running: Promise<void> | null = null;
  let again = false;

  const schedule = () => {
    timer = setTimeout(fire, options.delayMs);
  };

  function fire() {
    timer = null;
    if (options.busy() && Date.now() - firstKick < options.maxWaitMs) return schedule();
    running = run();
  }

  async function run() {
    again = false;
    try {
      const started = performance.now();
      await drainPeerStatisticsUntilIdle(db, { minLabs: options.minLabs });
      log(`peer statistics: recomputed in ${Math.round(performance.now() - started)} ms`);
    } catch (error) {
      // The requests stay in PostgreSQL; the next kick or the recovery sweep retries them.
      log(`peer statistics: recompute failed: ${(error as Error).message}`);
    }
    running = null;
    // Uploads stored while this pass ran may not have been seen by it: go again (after the delay).
    if (again && !timer) {
      firstKick = Date.now();
      schedule();
    }
  }

  return {
    kick() {
      if (running) {
        again = true;
        return;
      }
      if (timer) return;
      firstKick = Date.now();
      schedule();
    },
    async idle() {
      while (timer || running) {
        if (timer) {
          clearTimeout(timer);
          timer = null;
          running = run();
        }
        if (running) await running;
      }
    },
  };
}
