import { createRequire } from 'node:module';

/** The parts of @lhncbc/ucum-lhc we use (the package ships no type declarations). */
type UcumUtils = {
  validateUnitString(unit: string): {
    status: 'valid' | 'invalid' | 'error';
    ucumCode: string | null;
    msg: string[];
  };
  convertUnitTo(
    from: string,
    value: number,
    to: string,
    options?: { molecularWeight?: number | null },
  ): { status: 'succeeded' | 'failed' | 'error'; toVal: number | null; msg: string[] };
};

const require = createRequire(import.meta.url);
const ucum = require('@lhncbc/ucum-lhc') as { UcumLhcUtils: { getInstance(): UcumUtils } };
const utils = ucum.UcumLhcUtils.getInstance();

/** Why a unit string is not valid UCUM, or null when it is. */
export function ucumUnitProblem(unit: string): string | null {
  const result = utils.validateUnitString(unit);
  if (result.status === 'valid') return null;
  const why = result.msg.join(' ').trim();
  return `"${unit}" is not a valid UCUM unit${why ? `: ${why}` : ''}`;
}

/** Why values in `from` cannot be converted to `to` (mass <-> substance needs the molar mass), or null. */
export function ucumConversionProblem(from: string, to: string, molarMass: number | null): string | null {
  const result = utils.convertUnitTo(from, 1, to, molarMass ? { molecularWeight: molarMass } : {});
  if (result.status === 'succeeded') return null;
  const why = result.msg.join(' ').trim();
  return `${from} cannot be converted to ${to}${why ? `: ${why}` : ''}`;
}
