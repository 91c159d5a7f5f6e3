import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { performance } from 'node:perf_hooks';
import { createStack, sleep, storedRows, uploadFile, valuesFile, waitStored, type Stack } from './harness.ts';
import { recordFigure } from './figures.ts';

// Load: LOAD_UPLOADS labs upload LOAD_ROWS rows each at the same moment while LOAD_READERS clients read
// peer reports for LOAD_SECONDS. Every upload must be stored once and every read answered; the report's
// latency is measured and printed, never asserted (speed is a figure, not a test).

const UPLOADS = Number(process.env.LOAD_UPLOADS ?? 20);
const ROWS = Number(process.env.LOAD_ROWS ?? 50_000);
const READERS = Number(process.env.LOAD_READERS ?? 50);
const SECONDS = Number(process.env.LOAD_SECONDS ?? 30);
const WARMUP_SECONDS = 3;
const QUIET_SECONDS = 5;
const READER_LABS = 5;

let stack: Stack;
let api: Awaited<ReturnType<Stack['startApi']>>;

beforeAll(async () => {
  stack = await createStack('load');
  api = await stack.startApi();
  await stack.startSupervisedWorker();
});
afterAll(async () => {
  await stack?.close();
});

function percentile(sorted: number[], p: number): number {
  if (sorted.length === 0) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.ceil((p / 100) * sorted.length) - 1)];
}

function summary(latencies: number[]): string {
  const sorted = [...latencies].sort((a, b) => a - b);
  const ms = (v: number) => `${Math.round(v)} ms`;
  return `${sorted.length} reads: p50 ${ms(percentile(sorted, 50))}, p95 ${ms(percentile(sorted, 95))}, p99 ${ms(percentile(sorted, 99))}, max ${ms(sorted[sorted.length - 1] ?? NaN)}`;
}

describe('load', () => {
  it(`when ${UPLOADS} uploads of ${ROWS.toLocaleString('en')} rows arrive while ${READERS} clients read peer reports for ${SECONDS} s, then every upload is stored once and every read answered`, async () => {
    const lot = stack.catalogue.lot.lotNumber;
    // Labs whose reports are read: data of their own, and peers.
    const readerLabs: { lab: Awaited<ReturnType<Stack['makeLab']>>; id: string; reader: string }[] = [];
    for (let i = 0; i < READER_LABS; i++) {
      const lab = await stack.makeLab();
      const id = await uploadFile(api.url, lab.labToken, valuesFile(lot, 2_000, 100 + i));
      readerLabs.push({ lab, id, reader: await stack.makeReader(lab.lab.id) });
    }
    for (const r of readerLabs) expect(await waitStored(stack.db, r.id)).toBe('stored');
    const uploaders = [];
    for (let i = 0; i < UPLOADS; i++) uploaders.push(await stack.makeLab());
    const files = uploaders.map((_, i) => valuesFile(lot, ROWS, 1000 + i));

    // warmup (not reported: the API's first reports compile and fill caches); quiet: before the
    // uploads; load: until every upload is stored; after: the rest of the window.
    let phase: 'warmup' | 'quiet' | 'load' | 'after' | 'stop' = 'warmup';
    const latencies = {
      warmup: [] as number[],
      quiet: [] as number[],
      load: [] as number[],
      after: [] as number[],
    };
    const failures = new Map<string, number>();
    const readers = Array.from({ length: READERS }, async (_, n) => {
      const { lab, reader } = readerLabs[n % readerLabs.length];
      while (phase !== 'stop') {
        const current = phase;
        const started = performance.now();
        try {
          const res = await fetch(`${api.url}/api/labs/${lab.lab.id}/peer-report?period=2026-02`, {
            headers: { authorization: reader },
          });
          await res.arrayBuffer();
          if (res.status === 200) latencies[current].push(performance.now() - started);
          else failures.set(String(res.status), (failures.get(String(res.status)) ?? 0) + 1);
        } catch (error) {
          const cause = (error as Error & { cause?: { code?: string; message?: string } }).cause;
          const key = `${(error as Error).message}${cause ? ` (${cause.code ?? cause.message})` : ''}`;
          failures.set(key, (failures.get(key) ?? 0) + 1);
        }
      }
    });

    await sleep(WARMUP_SECONDS * 1000);
    phase = 'quiet';
    await sleep(QUIET_SECONDS * 1000);
    phase = 'load';
    const loadStarted = performance.now();
    const ids = await Promise.all(uploaders.map((lab, i) => uploadFile(api.url, lab.labToken, files[i])));
    const accepted = performance.now();
    const statuses = await Promise.all(ids.map((id) => waitStored(stack.db, id, 900_000)));
    const storedMs = performance.now() - loadStarted;
    phase = 'after';
    const remaining = SECONDS * 1000 - (performance.now() - loadStarted);
    if (remaining > 0) await sleep(remaining);
    phase = 'stop';
    await Promise.all(readers);

    const window = Math.max(SECONDS * 1000, storedMs);
    recordFigure(
      'load',
      `${UPLOADS} uploads × ${ROWS.toLocaleString('en')} rows: all accepted in ${((accepted - loadStarted) / 1000).toFixed(1)} s and stored once in ${(storedMs / 1000).toFixed(1)} s; ${READERS} readers over ${(window / 1000).toFixed(0)} s, ${[...failures].reduce((n, [, c]) => n + c, 0)} errors${failures.size ? ` (${[...failures].map(([k, c]) => `${k}: ${c}`).join('; ')})` : ''}`,
    );
    recordFigure('peer report, quiet (no uploads)', summary(latencies.quiet));
    recordFigure('peer report, while the uploads were being stored', summary(latencies.load));
    if (latencies.after.length) recordFigure('peer report, after the uploads', summary(latencies.after));

    expect(statuses).toEqual(ids.map(() => 'stored'));
    for (const id of ids) expect(await storedRows(stack.db, id)).toBe(ROWS);
    expect([...failures]).toEqual([]);
  });
});
