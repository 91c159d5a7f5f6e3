import { describe, expect, it } from 'vitest';
import { detectShifts, seededRandom } from '../src/index.ts';

// Average run lengths of the two-sided tabular CUSUM with k = 0.5, by shift in SDs, from
// Montgomery DC, Introduction to Statistical Quality Control, 6th ed., Table 9.3 (from memory).
const MONTGOMERY_ARL: Record<4 | 5, Record<number, number>> = {
  4: { 0: 168, 1: 8.38, 2: 3.34, 3: 2.19 },
  5: { 0: 465, 1: 10.4, 2: 4.01, 3: 2.57 },
};

/** Run length from a zero start: points until the first signal, for a series shifted from point 0. */
function runLength(random: ReturnType<typeof seededRandom>, shift: number, h: number): number {
  const series: number[] = [];
  for (;;) {
    // Grow in blocks; the CUSUM is re-run on the whole series, which is fine at these sizes.
    for (let j = 0; j < 500; j++) series.push(random.normal() + shift);
    const shifts = detectShifts(series, { h });
    if (shifts.length > 0) return shifts[0].signalIndex + 1;
  }
}

describe('detectShifts', () => {
  it('when the series is computed by hand, then C⁺ crosses h where the definition says', () => {
    // z = 0,0,0,0,3,3,3; k = 0.5: C⁺ = 0,0,0,0,2.5,5,7.5 → first > 5 at index 6; N⁺ = 3 so the change
    // point is index 4 and the new mean 0.5 + 7.5/3 = 3 (Montgomery §9.1 estimates, from memory).
    const [shift] = detectShifts([0, 0, 0, 0, 3, 3, 3]);
    expect(shift).toMatchObject({ index: 4, signalIndex: 6, direction: 'up', meanAfter: 3 });
    expect(shift.size).toBeCloseTo(3, 12);
  });

  it('when the series falls, then the lower CUSUM signals with a negative size, in the series units', () => {
    const series = [10, 10, 10, 10, 7, 7, 7, 7];
    const [shift] = detectShifts(series, { mean: 10, sd: 1.5 });
    // z = −2 from index 4: C⁻ = 1.5, 3, 4.5, 6 → signal at index 7, N⁻ = 4, size −(0.5 + 6/4) = −2.
    expect(shift).toMatchObject({ index: 4, signalIndex: 7, direction: 'down' });
    expect(shift.size).toBeCloseTo(-2, 12);
  });

  it('when a Shewhart limit is set, then one point beyond it signals at once (combined Shewhart-CUSUM, Lucas 1982)', () => {
    // z = 0.2, 0.1, 3.4: C⁺ = 0, 0, 2.9 < h, but 3.4 > 3 → signal at index 2, N⁺ = 1, size 0.5 + 2.9 = 3.4.
    expect(detectShifts([0.2, 0.1, 3.4])).toEqual([]);
    const [shift] = detectShifts([0.2, 0.1, 3.4], { shewhart: 3 });
    expect(shift).toMatchObject({ index: 2, signalIndex: 2, direction: 'up' });
    expect(shift.size).toBeCloseTo(3.4, 12);
    // Exactly on the limit is not beyond it.
    expect(detectShifts([0, 0, -3], { shewhart: 3 })).toEqual([]);
  });

  it('when inputs are bad, then it throws naming them', () => {
    expect(() => detectShifts([0, Number.NaN])).toThrow(
      'detectShifts: value at index 1 is not a finite number',
    );
    expect(() => detectShifts([0], { sd: 0 })).toThrow('detectShifts: sd must be greater than 0');
    expect(() => detectShifts([0], { h: -1 })).toThrow('detectShifts: h must be greater than 0');
  });

  it('when run from a zero start, then its ARLs match Montgomery Table 9.3 (from memory) within Monte Carlo error', () => {
    const random = seededRandom(20261204);
    for (const h of [4, 5] as const) {
      for (const shift of [0, 1, 2, 3]) {
        const count = shift === 0 ? 600 : 2000;
        const lengths = Array.from({ length: count }, () => runLength(random, shift, h));
        const mean = lengths.reduce((a, b) => a + b, 0) / count;
        const sd = Math.sqrt(lengths.reduce((a, b) => a + (b - mean) ** 2, 0) / (count - 1));
        const standardError = sd / Math.sqrt(count);
        const published = MONTGOMERY_ARL[h][shift];
        console.log(
          `CUSUM k=0.5 h=${h} shift=${shift} SD: ARL ${mean.toFixed(2)} ± ${standardError.toFixed(2)} (table ${published})`,
        );
        // 4 standard errors, plus 3 % for the table's rounding and approximation.
        expect(Math.abs(mean - published)).toBeLessThanOrEqual(4 * standardError + 0.03 * published);
      }
    }
  });

  // Stated targets (k = 0.5, h = 5): a shift at point 30 of 60 is detected within the remaining 30
  // points in ≥ 97 % of series for 1 SD and ≥ 99 % for 1.5 SD and more; the mean delay (points from
  // the first shifted point to the signal, inclusive) is at most the table ARL (above) · 1.1; the
  // median error of the change-point estimate is at most 1 point.
  const TARGETS: Record<number, { rate: number; delay: number }> = {
    1: { rate: 0.97, delay: 10.4 * 1.1 },
    1.5: { rate: 0.99, delay: 5.75 * 1.1 },
    2: { rate: 0.99, delay: 4.01 * 1.1 },
    3: { rate: 0.99, delay: 2.57 * 1.1 },
  };
  for (const size of [1, 1.5, 2, 3]) {
    it(`when a ${size} SD shift starts at point 30 (seeds 1–5, 200 series each), then detection rate, delay and change point meet the targets`, () => {
      let detected = 0;
      let delays = 0;
      const errors: number[] = [];
      let total = 0;
      for (const seed of [1, 2, 3, 4, 5]) {
        const random = seededRandom(seed * 1000 + size * 10);
        for (let s = 0; s < 200; s++) {
          const series = Array.from({ length: 60 }, (_, i) => random.normal() + (i >= 30 ? size : 0));
          total += 1;
          const found = detectShifts(series).find((shift) => shift.signalIndex >= 30);
          if (!found) continue;
          detected += 1;
          delays += found.signalIndex - 30 + 1;
          errors.push(Math.abs(found.index - 30));
        }
      }
      const rate = detected / total;
      const delay = delays / detected;
      errors.sort((a, b) => a - b);
      const medianError = errors[Math.floor(errors.length / 2)];
      console.log(
        `shift ${size} SD: detection rate ${rate.toFixed(3)}, mean delay ${delay.toFixed(2)} points, median change-point error ${medianError}`,
      );
      expect(rate).toBeGreaterThanOrEqual(TARGETS[size].rate);
      expect(delay).toBeLessThanOrEqual(TARGETS[size].delay);
      expect(medianError).toBeLessThanOrEqual(1);
    });
  }

  it('when the series has no shift, then the false-alarm rate per point is at most the stated 1/400', () => {
    // Stated: two-sided ARL0 ≈ 465 (table above) means about 0.0022 alarms per point; target ≤ 0.0025.
    let alarms = 0;
    let points = 0;
    for (const seed of [11, 12, 13, 14, 15]) {
      const random = seededRandom(seed);
      for (let s = 0; s < 400; s++) {
        const series = Array.from({ length: 60 }, () => random.normal());
        alarms += detectShifts(series).length;
        points += series.length;
      }
    }
    const rate = alarms / points;
    console.log(
      `no shift: ${alarms} alarms in ${points} points, ${rate.toFixed(5)} per point, ${((alarms / 2000) * 100).toFixed(1)} % of 60-point series`,
    );
    expect(rate).toBeLessThanOrEqual(1 / 400);
  });
});
