// The one place that imports jstat (a CommonJS package without types). The reference makes its
// declaration visible to every program that compiles this package's source (api, worker, db, web);
// an import cannot do this for an ambient module declaration.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference
/// <reference path="./jstat.d.ts" />
import jStat from 'jstat';

/** Standard normal cumulative distribution Φ(z). */
export function normalCdf(z: number): number {
  return jStat.normal.cdf(z, 0, 1);
}

/** Standard normal quantile Φ⁻¹(p). */
export function normalQuantile(p: number): number {
  return jStat.normal.inv(p, 0, 1);
}

/** Student t quantile with `dof` degrees of freedom. */
export function studentTQuantile(p: number, dof: number): number {
  return jStat.studentt.inv(p, dof);
}

/** Chi-square cumulative distribution with `dof` degrees of freedom. */
export function chiSquareCdf(x: number, dof: number): number {
  return jStat.chisquare.cdf(x, dof);
}
