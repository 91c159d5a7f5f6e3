// @plumbline/stats: every computation of the service, as small pure functions.
// See docs/methods.md for the formulas, sources and choices.
export * from './summarize.ts';
export * from './pool.ts';
export { robustMeanSd, type RobustMeanSd, type RobustMeanSdOptions } from './robust-mean-sd.ts';
export * from './peer-statistics.ts';
export * from './standing.ts';
export * from './sigma.ts';
export * from './measurement-uncertainty.ts';
export * from './multirule.ts';
export * from './rank-confidence-interval.ts';
export { percentile } from './percentile.ts';
export * from './nonparametric-interval.ts';
export * from './robust-interval.ts';
export {
  boxCox,
  boxCoxInverse,
  boxCoxLambda,
  boxCoxLogLikelihood,
  type BoxCoxLambdaOptions,
} from './box-cox.ts';
export * from './screen-outliers.ts';
export * from './harris-boyd.ts';
export * from './verify-interval.ts';
export * from './harmonise-intervals.ts';
export * from './indirect-interval.ts';
export * from './bhattacharya.ts';
export * from './random.ts';
export * from './detect-shifts.ts';
export * from './qc-plan.ts';
export * from './qc-plan-recommend.ts';
export * from './lot-difference.ts';
