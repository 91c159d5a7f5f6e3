import { createRequire } from 'node:module';
import type { UnitSystem } from '@plumbline/contracts';

/** The one call of @lhncbc/ucum-lhc used here (the package ships no type declarations). */
type UcumUtils = {
  convertUnitTo(
    from: string,
    value: number,
    to: string,
    options?: { molecularWeight?: number },
  ): { status: 'succeeded' | 'failed' | 'error'; toVal: number | null; msg: string[] };
};

const require = createRequire(import.meta.url);
const ucum = require('@lhncbc/ucum-lhc') as { UcumLhcUtils: { getInstance(): UcumUtils } };
const utils = ucum.UcumLhcUtils.getInstance();

/** value_in_target = factor · value + offset; an SD (a difference) converts with the factor alone. */
export type Conversion = { factor: number; offset: number };

/** How an analyte's figures are shown: the unit, the conversion from the canonical unit and the decimals. */
export type DisplayUnit = {
  unit: string;
  conversion: Conversion;
  decimals: number;
  /** False when the canonical unit is shown (asked for SI, or no conventional unit UCUM can reach). */
  converted: boolean;
};

const cache = new Map<string, Conversion | null>();

/** Micro signs (U+00B5, U+03BC) become UCUM's "u". */
function ucumCode(unit: string): string {
  return unit.trim().replace(/[\u00b5\u03bc]/g, 'u');
}

/**
 * The conversion between two UCUM units with the NLM UCUM library; mass ↔ substance needs the molar mass
 * (g/mol). Null when UCUM cannot convert. Computed once per (from, to, molar mass).
 */
export function ucumConversion(from: string, to: string, molarMass: number | null): Conversion | null {
  const key = `${from}\u0000${to}\u0000${molarMass ?? ''}`;
  if (cache.has(key)) return cache.get(key)!;
  let found: Conversion | null;
  if (ucumCode(from) === ucumCode(to)) found = { factor: 1, offset: 0 };
  else {
    const options = molarMass ? { molecularWeight: molarMass } : {};
    const one = utils.convertUnitTo(ucumCode(from), 1, ucumCode(to), options);
    const zero = utils.convertUnitTo(ucumCode(from), 0, ucumCode(to), options);
    found =
      one.status === 'succeeded' && zero.status === 'succeeded' && one.toVal !== null && zero.toVal !== null
        ? { factor: one.toVal - zero.toVal, offset: zero.toVal }
        : null;
  }
  cache.set(key, found);
  return found;
}

/**
 * The unit an analyte is shown in under a unit system. Decimals keep the same resolution: the analyte's
 * decimals shifted by the order of magnitude of the factor (mmol/L with 2 → mg/dL ×18 with 1).
 */
export function displayUnitFor(
  analyte: { unit: string; conventionalUnit: string | null; molarMass: number | null; decimals: number },
  system: UnitSystem,
): DisplayUnit {
  const canonical: DisplayUnit = {
    unit: analyte.unit,
    conversion: { factor: 1, offset: 0 },
    decimals: analyte.decimals,
    converted: false,
  };
  if (system === 'si' || !analyte.conventionalUnit || analyte.conventionalUnit === analyte.unit)
    return canonical;
  const conversion = ucumConversion(analyte.unit, analyte.conventionalUnit, analyte.molarMass);
  if (!conversion || !(conversion.factor > 0)) return canonical;
  const shift = Math.round(Math.log10(conversion.factor));
  const decimals = Math.min(6, Math.max(0, analyte.decimals - shift));
  return { unit: analyte.conventionalUnit, conversion, decimals, converted: true };
}

/** A value (mean, daily value) in the display unit. */
export function convertValue(value: number, unit: DisplayUnit): number {
  return unit.converted ? unit.conversion.factor * value + unit.conversion.offset : value;
}

/** A spread (SD) in the display unit: a difference, so no offset. */
export function convertSpread(value: number, unit: DisplayUnit): number {
  return unit.converted ? Math.abs(unit.conversion.factor) * value : value;
}
