import { z } from 'zod';

/**
 * Every threshold the API and the worker share, read from the environment in one place. Both processes
 * call `thresholds()`; the first call parses, later calls return the same object. A bad value stops
 * the process at start-up with a message naming the variable.
 */
const thresholdsSchema = z.object({
  /** Labs a peer group needs before its figures are published (docs/methods.md §2: 3, a setting). */
  PEER_MIN_LABS: z.coerce.number().int().min(1).max(100).default(3),
  /** A monthly summary whose CV (100 · SD / mean) is above this, in %, is a row error (common practice: 50 %). */
  INGEST_MAX_CV_PCT: z.coerce.number().positive().max(1000).default(50),
  /** A monthly summary's n must be at most this (a month of QC has far fewer values; common practice). */
  INGEST_MAX_N: z.coerce.number().int().min(2).max(10_000_000).default(10_000),
  /** Row errors kept per upload; `rowsRejected` still counts them all. */
  INGEST_MAX_ROW_ERRORS: z.coerce.number().int().min(1).max(100_000).default(1000),
  /** A recommended QC plan detects the critical shift with at least this probability (Westgard: 0.90). */
  QC_PLAN_MIN_PED: z.coerce.number().gt(0).lt(1).default(0.9),
  /** A recommended QC plan rejects a good run with at most this probability (Westgard: 0.05). */
  QC_PLAN_MAX_PFR: z.coerce.number().gt(0).lt(1).default(0.05),
});

export type Thresholds = {
  peerMinLabs: number;
  maxCvPct: number;
  maxN: number;
  maxRowErrors: number;
  qcPlanMinPed: number;
  qcPlanMaxPfr: number;
};

/** The thresholds in `source` (an environment); throws with every bad variable named. */
export function parseThresholds(source: Record<string, string | undefined>): Thresholds {
  // An empty variable means "not set", as in a .env file with `PEER_MIN_LABS=`.
  const present = Object.fromEntries(
    Object.keys(thresholdsSchema.shape).map((key) => [key, source[key] === '' ? undefined : source[key]]),
  );
  const parsed = thresholdsSchema.safeParse(present);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`).join('\n');
    throw new Error(`Invalid threshold settings:\n${lines}`);
  }
  const t = parsed.data;
  return {
    peerMinLabs: t.PEER_MIN_LABS,
    maxCvPct: t.INGEST_MAX_CV_PCT,
    maxN: t.INGEST_MAX_N,
    maxRowErrors: t.INGEST_MAX_ROW_ERRORS,
    qcPlanMinPed: t.QC_PLAN_MIN_PED,
    qcPlanMaxPfr: t.QC_PLAN_MAX_PFR,
  };
}

let current: Thresholds | null = null;

/** The process's thresholds, read from process.env on the first call. */
export function thresholds(): Thresholds {
  current ??= parseThresholds(process.env);
  return current;
}
