import { describe, expect, it } from 'vitest';
import { evaluateTea, sigmaMetric, teaFromBiologicalVariation } from '../src/index.ts';

describe('sigmaMetric', () => {
  // Biochem Med 2018;28(2):020711, Table 2 (published rows): TEa %, bias %, CV % → printed σ.
  // Tolerance ±0.1 for the rounding of the printed inputs; albumin recomputes to 4.70.
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
  // Published TEa values, Biochem Med 2018.
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

describe('evaluateTea', () => {
  // US CLIA proficiency-testing acceptance limits of the 2024 rule (42 CFR 493.931), recalled
  // from memory of the rule, not re-read in the Federal Register: glucose ± 6 mg/dL or
  // ± 8 %, creatinine ± 0.2 mg/dL or ± 10 %, ALT ± 6 U/L or ± 15 % ("whichever is greater");
  // sodium ± 4 mmol/L and potassium ± 0.3 mmol/L (absolute only); chloride ± 5 % (percent only).
  // The evaluated figures follow from the rule's wording by arithmetic.
  const glucose = { absolute: 6, percent: 8 };
  const creatinine = { absolute: 0.2, percent: 10 };
  const alt = { absolute: 6, percent: 15 };

  it('when the concentration is low, then the absolute part governs (glucose 50 mg/dL: 6 mg/dL = 12 %)', () => {
    const tea = evaluateTea(glucose, 50);
    expect(tea.governing).toBe('absolute');
    expect(tea.teaUnits).toBe(6);
    expect(tea.teaPct).toBeCloseTo(12, 12);
  });

  it('when the concentration is high, then the percentage governs (glucose 200 mg/dL: 8 % = 16 mg/dL)', () => {
    const tea = evaluateTea(glucose, 200);
    expect(tea).toMatchObject({ governing: 'percent', teaPct: 8 });
    expect(tea.teaUnits).toBeCloseTo(16, 12);
  });

  it('when both parts give the same limit, then governing is both (glucose 75 mg/dL: 6 mg/dL = 8 %)', () => {
    expect(evaluateTea(glucose, 75)).toEqual({ teaPct: 8, teaUnits: 6, governing: 'both' });
  });

  it('when creatinine and ALT controls sit at two levels, then each level gets its own TEa %', () => {
    expect(evaluateTea(creatinine, 1).teaPct).toBeCloseTo(20, 12); // 0.2 mg/dL of 1.0 mg/dL
    expect(evaluateTea(creatinine, 4).teaPct).toBe(10); // 10 % = 0.4 mg/dL > 0.2 mg/dL
    expect(evaluateTea(alt, 30).teaPct).toBeCloseTo(20, 12); // 6 U/L of 30 U/L
    expect(evaluateTea(alt, 120).teaPct).toBe(15); // 15 % = 18 U/L > 6 U/L
  });

  it('when the rule has one part, then that part is the TEa (sodium ± 4 mmol/L at 140; chloride ± 5 %)', () => {
    const sodium = evaluateTea({ absolute: 4, percent: null }, 140);
    expect(sodium.governing).toBe('absolute');
    expect(sodium.teaPct).toBeCloseTo((100 * 4) / 140, 12);
    expect(evaluateTea({ absolute: 0.3 }, 4).teaPct).toBeCloseTo(7.5, 12); // potassium
    expect(evaluateTea({ percent: 5 }, 100)).toEqual({ teaPct: 5, teaUnits: 5, governing: 'percent' });
  });

  it('when used for the sigma metric, then σ differs between the levels of one control (glucose, bias 2 %, CV 2 %)', () => {
    // σ = (TEa % − |bias %|) / CV % (Westgard 2001): (12 − 2)/2 = 5 at 50 mg/dL, (8 − 2)/2 = 3 at 200 mg/dL.
    expect(sigmaMetric(evaluateTea(glucose, 50).teaPct, 2, 2)).toBeCloseTo(5, 12);
    expect(sigmaMetric(evaluateTea(glucose, 200).teaPct, 2, 2)).toBeCloseTo(3, 12);
  });

  it('when the concentration is negative, then its magnitude is used', () => {
    expect(evaluateTea({ absolute: 1, percent: 10 }, -20)).toEqual({
      teaPct: 10,
      teaUnits: 2,
      governing: 'percent',
    });
  });

  it('when the rule or concentration is unusable, then it throws naming the problem', () => {
    expect(() => evaluateTea({}, 5)).toThrow(
      'evaluateTea: the rule has neither an absolute nor a percentage part',
    );
    expect(() => evaluateTea({ absolute: 0 }, 5)).toThrow(
      'evaluateTea: absolute must be greater than 0, got 0',
    );
    expect(() => evaluateTea({ percent: -1 }, 5)).toThrow(
      'evaluateTea: percent must be greater than 0, got -1',
    );
    expect(() => evaluateTea({ percent: 5 }, Number.NaN)).toThrow(
      'evaluateTea: concentration must be a finite number, got NaN',
    );
    expect(() => evaluateTea({ absolute: 4 }, 0)).toThrow('evaluateTea: concentration is 0');
    expect(evaluateTea({ percent: 5 }, 0)).toEqual({ teaPct: 5, teaUnits: 0, governing: 'percent' });
  });
});
