// How figures are written on the peer-group page. Means and SDs get two more decimals than the
// analyte's reporting decimals, so a change from an adjustment is visible; CVs one decimal.

export function formatValue(value: number | null | undefined, decimals: number): string {
  return value === null || value === undefined || !Number.isFinite(value) ? '—' : value.toFixed(decimals);
}

export const meanDecimals = (analyteDecimals: number) => Math.min(analyteDecimals + 2, 6);

export function formatPercent(value: number | null | undefined): string {
  return formatValue(value, 1);
}

export const tierTitles = {
  instrument: 'Same instrument model, method and reagent',
  method: 'Same method',
  analyte: 'Every procedure for the analyte',
} as const;
