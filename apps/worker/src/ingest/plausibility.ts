import { reject, type Ctx } from './row-issues.ts';
import type { ProcedureInfo, RowContext } from './row-schemas.ts';

/**
 * Figures are kept between 1e-100 and 1e100 in magnitude (or exactly 0), so that squares and sums over
 * any month stay finite, normal IEEE 754 doubles (common practice: a safety net below the catalogue's
 * plausibility limits, for analytes without them).
 */
const MIN_MAGNITUDE = 1e-100;
const MAX_MAGNITUDE = 1e100;

export const shown = (value: number) =>
  Number.isFinite(value) ? String(Number(value.toPrecision(6))) : String(value);

/** A figure in the analyte's unit: finite, computable, within the catalogue's plausibility limits. */
export function plausibleFigure(ctx: Ctx, column: string, value: number, procedure: ProcedureInfo): boolean {
  const unit = procedure.analyteUnit;
  if (!Number.isFinite(value)) {
    reject(ctx, column, 'not_finite', `${column} is not a finite number once converted to ${unit}`);
    return false;
  }
  const { plausibleLow: low, plausibleHigh: high } = procedure;
  if ((low !== null && value < low) || (high !== null && value > high)) {
    const range = `${low ?? '−∞'} to ${high ?? '∞'} ${unit}`;
    const source = procedure.plausibilitySource ? `; source: ${procedure.plausibilitySource}` : '';
    reject(
      ctx,
      column,
      'implausible_value',
      `${column} ${shown(value)} ${unit} is outside the plausible range of ${procedure.analyteName} (${range}${source})`,
    );
    return false;
  }
  const magnitude = Math.abs(value);
  if (magnitude !== 0 && (magnitude < MIN_MAGNITUDE || magnitude > MAX_MAGNITUDE)) {
    reject(
      ctx,
      column,
      'out_of_range',
      `${column} ${shown(value)} ${unit} is outside the range figures are computed in (1e-100 to 1e100)`,
    );
    return false;
  }
  return true;
}

/** Mean > 0 (unless the analyte allows negative results), SD computable, CV and n within the settings. */
export function plausibleSummary(
  ctx: Ctx,
  row: { procedure: ProcedureInfo; n: number; mean: number; sd: number },
  context: RowContext,
): boolean {
  const { procedure, n, mean, sd } = row;
  let ok = plausibleFigure(ctx, 'mean', mean, procedure);
  if (ok && !procedure.allowsNegative && !(mean > 0)) {
    reject(
      ctx,
      'mean',
      'mean_not_positive',
      `mean must be greater than 0 for ${procedure.analyteName}, got ${shown(mean)} ${procedure.analyteUnit}`,
    );
    ok = false;
  }
  if (!Number.isFinite(sd)) {
    reject(ctx, 'sd', 'not_finite', `sd is not a finite number once converted to ${procedure.analyteUnit}`);
    ok = false;
  } else if (sd < MIN_MAGNITUDE || sd > MAX_MAGNITUDE) {
    reject(
      ctx,
      'sd',
      'out_of_range',
      `sd ${shown(sd)} is outside the range figures are computed in (1e-100 to 1e100)`,
    );
    ok = false;
  } else if (ok && mean > 0) {
    const cv = (100 * sd) / mean;
    if (cv > context.limits.maxCvPct) {
      reject(
        ctx,
        'sd',
        'cv_too_high',
        `the CV (100 · sd / mean) is ${shown(cv)} %, above the network's limit of ${context.limits.maxCvPct} %`,
      );
      ok = false;
    }
  }
  if (n > context.limits.maxN) {
    reject(ctx, 'n', 'n_too_large', `n must be at most ${context.limits.maxN}, got ${n}`);
    ok = false;
  }
  return ok;
}
