import { describe, expect, it } from 'vitest';
import { createSingleFlight } from './single-flight.ts';

describe('single flight', () => {
  it('when the same key is asked for while it is computed, then both callers share one computation', async () => {
    const run = createSingleFlight<number>();
    let computations = 0;
    let release!: (value: number) => void;
    const compute = () => {
      computations += 1;
      return new Promise<number>((resolve) => (release = resolve));
    };
    const first = run('a', compute);
    const second = run('a', compute);
    release(42);
    expect(await Promise.all([first, second])).toEqual([42, 42]);
    expect(computations).toBe(1);
  });

  it('when a computation has settled, then the next caller starts a fresh one (nothing is cached)', async () => {
    const run = createSingleFlight<number>();
    let computations = 0;
    const compute = async () => ++computations;
    expect(await run('a', compute)).toBe(1);
    expect(await run('a', compute)).toBe(2);
  });

  it('when keys differ, or a computation fails, then callers are not mixed and the failure reaches every caller of it', async () => {
    const run = createSingleFlight<number>();
    expect(await Promise.all([run('a', async () => 1), run('b', async () => 2)])).toEqual([1, 2]);
    const failing = () => Promise.reject(new Error('database away'));
    const results = await Promise.allSettled([run('c', failing), run('c', failing)]);
    expect(results.map((r) => r.status)).toEqual(['rejected', 'rejected']);
    expect(await run('c', async () => 3)).toBe(3);
  });
});
