import { boxCoxLambda, boxCoxUnchecked } from './box-cox.ts';
import { harrisBoyd, type HarrisBoydResult } from './harris-boyd.ts';
import {
  nonparametricInterval,
  type NonparametricInterval,
  type NonparametricIntervalOptions,
} from './nonparametric-interval.ts';
import { checkValues, fail } from './validate.ts';

/** One site's reference values for the same analyte and partition. */
export interface SiteValues {
  id: string;
  values: readonly number[];
}

export interface SiteComparison extends HarrisBoydResult {
  a: string;
  b: string;
}

export interface Harmonisation {
  /** Harris & Boyd between every pair of sites. */
  comparisons: SiteComparison[];
  /** True when no pair needs separate intervals. */
  shareable: boolean;
  /** λ used before the comparisons (null when not transformed). */
  lambda: number | null;
  /** Nonparametric interval of all sites' values together. */
  pooled: NonparametricInterval;
}

export interface HarmonisationOptions extends NonparametricIntervalOptions {
  /** Transform all values with one Box-Cox λ (estimated on the pooled values) before comparing (default 'none'). */
  transform?: 'none' | 'box-cox';
}

/**
 * Can network sites share one reference interval? Runs {@link harrisBoyd} between every pair of
 * sites (optionally after a common Box-Cox transform, since the test assumes Gaussian data); the
 * sites can share when no pair needs partitioning. The pooled interval is the nonparametric
 * interval of all values together (in original units), reported whether or not they can share.
 *
 * Source: Harris EK, Boyd JC, Clin Chem 1990;36:265–270 (between subgroups, here sites);
 * CLSI EP28-A3c (pooled nonparametric interval); docs/methods.md §5 (network harmonisation).
 *
 * @throws {Error} when there are fewer than 2 sites, an id is empty or repeated, a site has fewer
 *   than 2 values, a value is not finite (or not > 0 with 'box-cox'), or the pooled interval cannot
 *   be computed (too few values in total).
 * @example
 * const north = Array.from({ length: 60 }, (_, i) => 138 + (i % 5)); // 138 … 142, 12 times each
 * const south = north.map((v) => v + 0.5);
 * const result = harmoniseIntervals([{ id: 'north', values: north }, { id: 'south', values: south }]);
 * result.comparisons; // => [{ a: 'north', b: 'south', z: 1.9202864369671522, zCritical: 2.121320343559643, sdRatio: 1, partition: false }]
 * result.shareable; // => true
 * result.pooled.lower.value; // => 138
 */
export function harmoniseIntervals(
  sites: readonly SiteValues[],
  options: HarmonisationOptions = {},
): Harmonisation {
  const fn = 'harmoniseIntervals';
  if (!Array.isArray(sites) || sites.length < 2)
    fail(fn, `needs at least 2 sites, got ${sites?.length ?? 0}`);
  const ids = new Set<string>();
  for (const site of sites) {
    if (typeof site.id !== 'string' || site.id === '') fail(fn, 'every site needs an id');
    if (ids.has(site.id)) fail(fn, `site id '${site.id}' appears more than once`);
    ids.add(site.id);
    checkValues(fn, site.values, 2, ` of site '${site.id}'`);
  }
  const all = sites.flatMap((site) => [...site.values]);
  const transform = options.transform ?? 'none';
  if (transform !== 'none' && transform !== 'box-cox') fail(fn, `unknown transform '${String(transform)}'`);
  let lambda: number | null = null;
  let compared: readonly (readonly number[])[] = sites.map((site) => site.values);
  if (transform === 'box-cox') {
    all.forEach((v) => {
      if (v <= 0) fail(fn, `a Box-Cox transform needs values greater than 0, got ${v}`);
    });
    const fitted = boxCoxLambda(all);
    lambda = fitted;
    compared = sites.map((site) => site.values.map((v: number) => boxCoxUnchecked(v, fitted)));
  }
  const comparisons: SiteComparison[] = [];
  for (let i = 0; i < sites.length; i++) {
    for (let j = i + 1; j < sites.length; j++) {
      comparisons.push({ a: sites[i].id, b: sites[j].id, ...harrisBoyd(compared[i], compared[j]) });
    }
  }
  return {
    comparisons,
    shareable: comparisons.every((c) => !c.partition),
    lambda,
    pooled: nonparametricInterval(all, options),
  };
}
