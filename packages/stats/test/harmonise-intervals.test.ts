import { describe, expect, it } from 'vitest';
import { harmoniseIntervals, harrisBoyd, nonparametricInterval, seededRandom } from '../src/index.ts';

// Sites drawn from known distributions with a seeded generator (by construction; no published example).
function site(id: string, mean: number, sd: number, n: number, seed: number) {
  const random = seededRandom(seed);
  return { id, values: Array.from({ length: n }, () => random.normal(mean, sd)) };
}

describe('harmoniseIntervals (Harris & Boyd between sites; pooled EP28 interval)', () => {
  it('when sites draw from the same population, then they can share and the pooled interval is the nonparametric interval of all values', () => {
    const sites = [
      site('north', 140, 2, 150, 1),
      site('south', 140, 2, 150, 2),
      site('east', 140, 2, 150, 3),
    ];
    const result = harmoniseIntervals(sites);
    expect(result.comparisons).toHaveLength(3);
    expect(result.comparisons.map((c) => `${c.a}-${c.b}`)).toEqual([
      'north-south',
      'north-east',
      'south-east',
    ]);
    expect(result.shareable).toBe(true);
    expect(result.pooled).toEqual(nonparametricInterval(sites.flatMap((s) => s.values)));
    expect(result.lambda).toBeNull();
  });

  it('when one site is shifted by 2 SD, then it cannot share and its comparisons say why', () => {
    const sites = [
      site('north', 140, 2, 150, 1),
      site('south', 140, 2, 150, 2),
      site('west', 144, 2, 150, 4),
    ];
    const result = harmoniseIntervals(sites);
    expect(result.shareable).toBe(false);
    const west = result.comparisons.filter((c) => c.b === 'west');
    expect(west.every((c) => c.partition && c.z > c.zCritical)).toBe(true);
    expect(result.comparisons[0]).toEqual({
      a: 'north',
      b: 'south',
      ...harrisBoyd(sites[0].values, sites[1].values),
    });
  });

  it("when 'box-cox' is asked, then one λ is estimated on the pooled values and reported", () => {
    const logSites = [site('a', 3, 0.3, 150, 5), site('b', 3, 0.3, 150, 6)].map((s) => ({
      ...s,
      values: s.values.map(Math.exp),
    }));
    const result = harmoniseIntervals(logSites, { transform: 'box-cox' });
    expect(result.lambda).not.toBeNull();
    expect(Math.abs(result.lambda!)).toBeLessThan(0.5); // log-normal data: λ near 0
    expect(result.shareable).toBe(true);
  });

  it('when the input is invalid, then it throws naming the function and the site', () => {
    expect(() => harmoniseIntervals([site('a', 1, 1, 50, 1)])).toThrow(
      'harmoniseIntervals: needs at least 2 sites, got 1',
    );
    expect(() => harmoniseIntervals([site('a', 1, 1, 50, 1), site('a', 1, 1, 50, 2)])).toThrow(
      "harmoniseIntervals: site id 'a' appears more than once",
    );
    expect(() => harmoniseIntervals([site('a', 1, 1, 50, 1), { id: 'b', values: [1] }])).toThrow(
      "harmoniseIntervals: needs at least 2 values of site 'b', got 1",
    );
    expect(() =>
      harmoniseIntervals([site('a', 0, 1, 50, 1), site('b', 0, 1, 50, 2)], { transform: 'box-cox' }),
    ).toThrow('harmoniseIntervals: a Box-Cox transform needs values greater than 0');
  });
});
