import { describe, expect, it } from 'vitest';
import { analyteCreateSchema, loincCheckDigit, loincProblem } from './catalogue-admin.ts';

// Real LOINC codes, quoted from memory (LOINC table, Regenstrief Institute): the digit after the
// hyphen is the published mod-10 check digit, so computing it from the part before must agree.
const realLoincCodes = [
  ['2951-2', 'Sodium [Moles/volume] in Serum or Plasma'],
  ['2345-7', 'Glucose [Mass/volume] in Serum or Plasma'],
  ['2823-3', 'Potassium [Moles/volume] in Serum or Plasma'],
  ['2160-0', 'Creatinine [Mass/volume] in Serum or Plasma'],
  ['718-7', 'Hemoglobin [Mass/volume] in Blood'],
] as const;

describe('LOINC check digit', () => {
  it.each(realLoincCodes)(
    'when the code is %s (%s), then the computed check digit matches the published one',
    (code) => {
      const [base, check] = code.split('-');
      expect(loincCheckDigit(base)).toBe(Number(check));
      expect(loincProblem(code)).toBeNull();
    },
  );

  it('when one digit of a real code is mistyped, then the check digit exposes it', () => {
    // 2951-2 with its second digit changed: the mod-10 scheme catches every single-digit error.
    expect(loincProblem('2851-2')).toMatch(/check digit does not match: 2851-\d expected/);
    expect(loincProblem('2345-8')).toMatch(/2345-7 expected/);
  });

  it('when the code is not digits-hyphen-digit, then the format is explained', () => {
    for (const bad of ['2951', '2951-', 'A951-2', '2951-23', '']) {
      expect(loincProblem(bad)).toMatch(/expected a LOINC code/);
    }
  });

  it('when an analyte is created with a wrong check digit, then the contract names the loinc field', () => {
    const result = analyteCreateSchema.safeParse({
      code: 'NA',
      name: 'Sodium',
      unit: 'mmol/L',
      loinc: '2951-3',
    });
    expect(result.success).toBe(false);
    expect(result.error?.issues.map((i) => i.path.join('.'))).toEqual(['loinc']);
  });
});
