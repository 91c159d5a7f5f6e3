import { describe, expect, it } from 'vitest';
import { UnitConverter, normalizeUnit } from './units.ts';

// Expected factors are the textbook conversion factors used in every laboratory
// (common practice): glucose mmol/L = mg/dL ÷ 18.016 (molar mass 180.16 g/mol); creatinine
// µmol/L = mg/dL × 88.42 (113.12 g/mol). The converter itself is the NLM UCUM library.
describe('UnitConverter', () => {
  const units = new UnitConverter();

  it('when glucose is in mg/dL, then mmol/L = mg/dL ÷ 18.016 (textbook factor, common practice)', () => {
    const conversion = units.conversion('mg/dL', 'mmol/L', 180.16);
    if ('problem' in conversion) throw new Error(conversion.problem);
    expect(conversion.factor * 90 + conversion.offset).toBeCloseTo(90 / 18.016, 10);
    expect(conversion.offset).toBe(0);
  });

  it('when creatinine is in mg/dL, then µmol/L ≈ mg/dL × 88.42 (textbook factor, common practice; 0.05 % tolerance)', () => {
    const conversion = units.conversion('mg/dL', 'umol/L', 113.12);
    if ('problem' in conversion) throw new Error(conversion.problem);
    expect(Math.abs(conversion.factor / 88.42 - 1)).toBeLessThan(5e-4);
  });

  it('when units differ only by prefix, then no molar mass is needed (g/dL → g/L × 10)', () => {
    const conversion = units.conversion('g/dL', 'g/L', null);
    if ('problem' in conversion) throw new Error(conversion.problem);
    expect(conversion.factor).toBeCloseTo(10, 12);
  });

  it('when mass must become substance but the catalogue has no molar mass, then the problem says so', () => {
    const conversion = units.conversion('mg/dL', 'mmol/L', null);
    expect(conversion).toEqual({ problem: expect.stringMatching(/no molar mass/) });
  });

  it('when the dimensions cannot match, then the conversion is refused', () => {
    expect(units.conversion('U/L', 'mmol/L', 180.16)).toEqual({
      problem: expect.stringMatching(/cannot be converted/),
    });
  });

  it('when a unit is not UCUM, then it is named; micro signs are read as "u"', () => {
    expect(units.problemWithUnit('mmol/L')).toBeNull();
    expect(units.problemWithUnit('millimoles')).toMatch(/not a UCUM unit/);
    expect(normalizeUnit(' µmol/L ')).toBe('umol/L');
    expect(normalizeUnit('μmol/L')).toBe('umol/L');
  });
});
