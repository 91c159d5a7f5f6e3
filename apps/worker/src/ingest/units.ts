import ucum from '@lhncbc/ucum-lhc';

type UcumUtils = {
  validateUnitString(unit: string): { status: string; msg: string[] };
  convertUnitTo(
    from: string,
    value: number,
    to: string,
    options?: { molecularWeight?: number },
  ): { status: string; toVal: number | null; msg: string[] };
};

const utils = (ucum as unknown as { UcumLhcUtils: { getInstance(): UcumUtils } }).UcumLhcUtils.getInstance();

/** A conversion value_in_target = factor · value + offset (offset is 0 except for units such as Cel). */
export type Conversion = { factor: number; offset: number };

/** Micro signs (U+00B5, U+03BC) become UCUM's "u"; surrounding spaces are dropped. */
export function normalizeUnit(unit: string): string {
  return unit.trim().replace(/[\u00b5\u03bc]/g, 'u');
}

/**
 * Converts values between UCUM units with the NLM UCUM library (@lhncbc/ucum-lhc); mass ↔ substance
 * conversions use the analyte's molar mass from the catalogue. Conversions are computed once per
 * (unit, target, molar mass) and then applied as a factor, so a million rows cost a million multiplications.
 */
export class UnitConverter {
  private readonly valid = new Map<string, string | null>();
  /** target unit → molar mass → source unit → conversion (nested, so a row costs no key string). */
  private readonly conversions = new Map<
    string,
    Map<number | null, Map<string, Conversion | { problem: string }>>
  >();

  /** Null when UCUM knows the unit, otherwise why not. */
  problemWithUnit(unit: string): string | null {
    let problem = this.valid.get(unit);
    if (problem === undefined) {
      const result = utils.validateUnitString(unit);
      problem =
        result.status === 'valid'
          ? null
          : `"${unit}" is not a UCUM unit${result.msg.length ? ` (${result.msg.join('; ')})` : ''}`;
      this.valid.set(unit, problem);
    }
    return problem;
  }

  conversion(from: string, to: string, molarMass: number | null): Conversion | { problem: string } {
    let byMolarMass = this.conversions.get(to);
    if (!byMolarMass) {
      byMolarMass = new Map();
      this.conversions.set(to, byMolarMass);
    }
    const mass = molarMass ?? null;
    let bySource = byMolarMass.get(mass);
    if (!bySource) {
      bySource = new Map();
      byMolarMass.set(mass, bySource);
    }
    let found = bySource.get(from);
    if (!found) {
      found = this.compute(from, to, molarMass);
      bySource.set(from, found);
    }
    return found;
  }

  private compute(from: string, to: string, molarMass: number | null): Conversion | { problem: string } {
    if (from === to) return { factor: 1, offset: 0 };
    const options = molarMass ? { molecularWeight: molarMass } : {};
    const one = utils.convertUnitTo(from, 1, to, options);
    const zero = utils.convertUnitTo(from, 0, to, options);
    if (
      one.status !== 'succeeded' ||
      zero.status !== 'succeeded' ||
      one.toVal === null ||
      zero.toVal === null
    ) {
      const needsMolarMass = !molarMass && (one.msg ?? []).some((m) => /molecular weight/i.test(m));
      return {
        problem: needsMolarMass
          ? `${from} cannot be converted to ${to}: the catalogue holds no molar mass for this analyte`
          : `${from} cannot be converted to ${to}`,
      };
    }
    return { factor: one.toVal - zero.toVal, offset: zero.toVal };
  }
}
