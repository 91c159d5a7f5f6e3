import { describe, expect, it } from 'vitest';
import { sigmaMetric, teaFromBiologicalVariation } from '../src/index.ts';

describe('sigmaMetric', () => {
  // Biochem Med 2018;28(2):020711, Table 2 (published rows): TEa %, bias %, CV % → printed σ.
  // Tolerance ±0.1 for the rounding of the printed inputs (CHECKS.md); albumin recomputes to 4.70.
  const rows = [
    { analyte: 'ALT', tea: 27.48, bias: 8.7, cv: 4.6, printed: 4.1 },
    { analyte: 'albumin', tea: 10.0, bias: 0.6, cv: 2.0, printed: 4.6 },
    { analyte: 'ALP', tea: 30.0, bias: 2.7, cv: 5.0, printed: 5.4 },
    { analyte: 'creatinine', tea: 8.87, bias: 1.9, cv: 3.8, printed: 1.8 },
    { analyte: 'glucose', tea: 10.0, bias: 1.7, cv: 2.1, printed: 3.9 },
  ];
  for (const row of rows) {
    it(`when given the ${row.analyte} row, then σ is the printed ${row.printed} ± 0.1 (Biochem Med 2018, Table 2)`, () => {
      expect(Math.abs(sigmaMetric(row.tea, row.bias, row.cv) - row.printed)).toBeLessThanOrEqual(0.1 + 1e-9);
    });
  }

  it('when the bias is negative, then its absolute value is used (definition)', () => {
    expect(sigmaMetric(10, -1.7, 2.1)).toBe(sigmaMetric(10, 1.7, 2.1));
  });

  it('when TEa or CV is not positive, then it throws naming the input', () => {
    expect(() => sigmaMetric(0, 1, 2)).toThrow('sigmaMetric: teaPct must be greater than 0, got 0');
    expect(() => sigmaMetric(10, 1, 0)).toThrow('sigmaMetric: cvPct must be greater than 0, got 0');
    expect(() => sigmaMetric(10, Number.NaN, 2)).toThrow(
      'sigmaMetric: biasPct must be a finite number, got NaN',
    );
  });
});

describe('teaFromBiologicalVariation', () => {
  // Desirable specification, TEa < 1.65·(0.5·CV_I) + 0.25·√(CV_I² + CV_G²) (Fraser; Clin Chem 2005;51:450).
  // Published TEa values, Biochem Med 2018 (as listed in CHECKS.md).
  const rows = [
    { analyte: 'potassium', cvI: 4.6, cvG: 5.6, tea: 5.61 },
    { analyte: 'creatinine', cvI: 5.95, cvG: 14.7, tea: 8.87 },
    { analyte: 'cholesterol', cvI: 5.95, cvG: 15.3, tea: 9.01 },
  ];
  for (const row of rows) {
    it(`when given ${row.analyte} CV_I ${row.cvI}, CV_G ${row.cvG}, then TEa rounds to the published ${row.tea} %`, () => {
      expect(Math.round(teaFromBiologicalVariation(row.cvI, row.cvG).teaPct * 100) / 100).toBe(row.tea);
    });
  }

  it('when asked for the optimum or minimum level, then the factors are half and one and a half times the desirable ones (Fraser 2001, memory)', () => {
    const desirable = teaFromBiologicalVariation(4.6, 5.6);
    expect(teaFromBiologicalVariation(4.6, 5.6, 'optimum').teaPct).toBeCloseTo(desirable.teaPct / 2, 12);
    expect(teaFromBiologicalVariation(4.6, 5.6, 'minimum').teaPct).toBeCloseTo(desirable.teaPct * 1.5, 12);
  });

  it('when a CV is not positive or the level unknown, then it throws', () => {
    expect(() => teaFromBiologicalVariation(0, 5)).toThrow(
      'teaFromBiologicalVariation: cvWithinPct must be greater than 0, got 0',
    );
    expect(() => teaFromBiologicalVariation(4, 5, 'best' as never)).toThrow(
      "teaFromBiologicalVariation: unknown level 'best'",
    );
  });
});
