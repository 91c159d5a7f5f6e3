import { describe, expect, it } from 'vitest';
import { rowErrorsOf, summaryRowSchema, valueRowSchema, type RowContext } from './row-schemas.ts';
import { UnitConverter } from './units.ts';

const glucose = {
  id: '00000000-0000-4000-8000-000000000001',
  code: 'GLU1',
  labId: '00000000-0000-4000-8000-0000000000aa',
  analyteId: '00000000-0000-4000-8000-0000000000bb',
  analyteName: 'Glucose',
  analyteUnit: 'mmol/L',
  molarMass: 180.16,
  // Plausibility limits for the tests only (common practice, not a published range).
  plausibleLow: 0.5,
  plausibleHigh: 50,
  plausibilitySource: 'common practice',
  allowsNegative: false,
};
const context = (decimalComma = false): RowContext => ({
  decimalComma,
  procedures: new Map([['GLU1', glucose]]),
  lots: new Map([
    ['LOT1', { id: '00000000-0000-4000-8000-0000000000cc', lotNumber: 'LOT1', levels: [1, 2] }],
  ]),
  periods: new Map([['2026-03', { period: '2026-03', state: 'open' as const }]]),
  units: new UnitConverter(),
  // The defaults of the network's settings (INGEST_MAX_CV_PCT, INGEST_MAX_N).
  limits: { maxCvPct: 50, maxN: 10_000 },
});
const row = {
  period: '2026-03',
  procedure: 'GLU1',
  control_lot: 'LOT1',
  level: '1',
  n: '20',
  mean: '5.5',
  sd: '0.12',
  unit: 'mmol/L',
};
const codesOf = (input: Record<string, string>, ctx = context()) => {
  const result = summaryRowSchema(ctx).safeParse(input);
  return result.success
    ? []
    : rowErrorsOf(result.error.issues, 7, (c) => `My ${c}`).map((e) => [e.column, e.code]);
};

describe('summary rows', () => {
  it('when the row is valid, then it resolves the procedure and lot and keeps the figures', () => {
    const result = summaryRowSchema(context()).parse(row);
    expect(result).toMatchObject({
      level: 1,
      n: 20,
      mean: 5.5,
      sd: 0.12,
      procedure: { id: glucose.id },
      period: { period: '2026-03' },
    });
  });

  it('when n < 2, SD ≤ 0 or the mean is not a number, then each error names its column in the file', () => {
    expect(codesOf({ ...row, n: '1' })).toEqual([['My n', 'n_too_small']]);
    expect(codesOf({ ...row, sd: '0' })).toEqual([['My sd', 'sd_not_positive']]);
    expect(codesOf({ ...row, sd: '-0.1' })).toEqual([['My sd', 'sd_not_positive']]);
    expect(codesOf({ ...row, mean: 'high' })).toEqual([['My mean', 'invalid_number']]);
    expect(codesOf({ ...row, mean: '' })).toEqual([['My mean', 'required']]);
  });

  it('when the procedure, lot, level or period is unknown, then the row is rejected for that column', () => {
    expect(codesOf({ ...row, procedure: 'NOPE' })).toEqual([['My procedure', 'unknown_procedure']]);
    expect(codesOf({ ...row, control_lot: 'LOT9' })).toEqual([['My control_lot', 'unknown_control_lot']]);
    expect(codesOf({ ...row, level: '3' })).toEqual([['My level', 'unknown_level']]);
    expect(codesOf({ ...row, period: '2026-3' })).toEqual([['My period', 'invalid_period']]);
    expect(codesOf({ ...row, period: '2031-01' })).toEqual([['My period', 'unknown_period']]);
  });

  it('when the unit is not UCUM or not convertible, then the unit column is named', () => {
    expect(codesOf({ ...row, unit: 'millimol' })).toEqual([['My unit', 'invalid_unit']]);
    expect(codesOf({ ...row, unit: 'U/L' })).toEqual([['My unit', 'unit_not_convertible']]);
  });

  it('when a row has several problems, then all are reported', () => {
    expect(codesOf({ ...row, n: 'x', mean: 'y', procedure: 'Z' })).toEqual([
      ['My procedure', 'unknown_procedure'],
      ['My n', 'invalid_integer'],
      ['My mean', 'invalid_number'],
    ]);
  });

  it('when the file allows decimal commas, then "5,5" is 5.5; otherwise the message explains', () => {
    expect(summaryRowSchema(context(true)).parse({ ...row, mean: '5,5', sd: '0,12' })).toMatchObject({
      mean: 5.5,
      sd: 0.12,
    });
    const result = summaryRowSchema(context(false)).safeParse({ ...row, mean: '5,5' });
    expect(result.success).toBe(false);
    expect(result.error?.issues[0].message).toMatch(
      /decimal comma is read only in semicolon-separated files/,
    );
  });

  it('when the unit is mg/dL, then mean and SD are converted to mmol/L (÷ 18.016, textbook factor, common practice)', () => {
    const result = summaryRowSchema(context()).parse({ ...row, mean: '99.1', sd: '2.2', unit: 'mg/dL' });
    expect(result.mean).toBeCloseTo(99.1 / 18.016, 10);
    expect(result.sd).toBeCloseTo(2.2 / 18.016, 10);
  });
});

describe('value rows', () => {
  const value = {
    measured_at: '2026-03-04T07:30',
    procedure: 'GLU1',
    control_lot: 'LOT1',
    level: '2',
    value: '12.1',
    unit: 'mmol/L',
    run: '',
    comment: '',
  };

  it('when the row is valid, then run and comment may be empty', () => {
    const result = valueRowSchema(context()).parse(value);
    expect(result).toMatchObject({
      level: 2,
      value: 12.1,
      run: null,
      comment: null,
      measuredAtMs: Date.UTC(2026, 2, 4, 7, 30),
    });
  });

  it('when the timestamp is not ISO 8601 or its month is not a cycle, then measured_at is named', () => {
    const bad = valueRowSchema(context()).safeParse({ ...value, measured_at: '04.03.2026' });
    expect(bad.success ? [] : rowErrorsOf(bad.error.issues, 3, (c) => c)).toMatchObject([
      { row: 3, column: 'measured_at', code: 'invalid_timestamp' },
    ]);
    const unknown = valueRowSchema(context()).safeParse({ ...value, measured_at: '2026-05-01' });
    expect(unknown.success ? [] : rowErrorsOf(unknown.error.issues, 3, (c) => c)).toMatchObject([
      { code: 'unknown_period' },
    ]);
  });

  it('when a comment would run as a spreadsheet formula, then it is kept behind an apostrophe (OWASP CSV Injection)', () => {
    const result = valueRowSchema(context()).parse({ ...value, comment: '=1+1\u0007' });
    expect(result.comment).toBe("'=1+1");
  });

  it('when a run code starts with =, then the row is refused for the run column', () => {
    const bad = valueRowSchema(context()).safeParse({ ...value, run: '@A1' });
    expect(bad.success ? [] : rowErrorsOf(bad.error.issues, 3, (c) => c)).toMatchObject([
      { column: 'run', code: 'formula_like' },
    ]);
  });
});

describe('plausibility of summary rows (test limits 0.5–50 mmol/L, common practice)', () => {
  it('when the mean is outside the limits once converted, then the mean column is named', () => {
    // 1000 mg/dL glucose = 55.5 mmol/L (÷ 18.016), above 50.
    expect(codesOf({ ...row, mean: '1000', sd: '10', unit: 'mg/dL' })).toEqual([
      ['My mean', 'implausible_value'],
    ]);
    expect(codesOf({ ...row, mean: '0.4', sd: '0.01' })).toEqual([['My mean', 'implausible_value']]);
  });

  it('when the CV is above the setting or n above its maximum, then those columns are named', () => {
    // CV = 100 · 3 / 5.5 = 54.5 % > 50 %.
    expect(codesOf({ ...row, sd: '3' })).toEqual([['My sd', 'cv_too_high']]);
    expect(codesOf({ ...row, sd: '2.75' })).toEqual([]); // exactly 50 %: allowed
    expect(codesOf({ ...row, n: '10001' })).toEqual([['My n', 'n_too_large']]);
    const strict = { ...context(), limits: { maxCvPct: 1, maxN: 10 } };
    expect(codesOf({ ...row, n: '11' }, strict)).toEqual([
      ['My sd', 'cv_too_high'],
      ['My n', 'n_too_large'],
    ]);
  });

  it('when the analyte has no limits, then a mean ≤ 0 is refused unless negative results are allowed', () => {
    const unlimited = { ...glucose, plausibleLow: null, plausibleHigh: null };
    const ctx = { ...context(), procedures: new Map([['GLU1', unlimited]]) };
    expect(codesOf({ ...row, mean: '-1' }, ctx)).toEqual([['My mean', 'mean_not_positive']]);
    const signed = { ...context(), procedures: new Map([['GLU1', { ...unlimited, allowsNegative: true }]]) };
    expect(codesOf({ ...row, mean: '-1' }, signed)).toEqual([]);
    expect(codesOf({ ...row, mean: '1e200', sd: '1' }, ctx)).toEqual([['My mean', 'out_of_range']]);
  });
});
