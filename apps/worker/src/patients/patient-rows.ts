import { createHmac } from 'node:crypto';
import { patientSettings, type RowError } from '@plumbline/contracts';
import { normalizeUnit, type UnitConverter } from '../ingest/units.ts';

/** A catalogue analyte as patient rows are checked against it. */
export type AnalyteInfo = {
  id: string;
  code: string;
  loinc: string | null;
  unit: string;
  molarMass: number | null;
  plausibleLow: number | null;
  plausibleHigh: number | null;
};

/** One de-identified result, ready to store. */
export type PatientRow = {
  analyteId: string;
  value: number;
  sex: 'female' | 'male';
  ageYears: number;
  collectedMonth: string;
  setting: string;
  sampleHash: string | null;
};

export type PatientContext = {
  labId: string;
  /** By code (upper case) and by LOINC code. */
  analytes: Map<string, AnalyteInfo>;
  units: UnitConverter;
  salt: string;
};

/** Salted hash of the lab's pseudonymous key: equal keys of one lab give equal hashes, nothing else. */
export function hashSampleKey(salt: string, labId: string, key: string): string {
  return createHmac('sha256', salt).update(`${labId}\u0000${key}`).digest('hex');
}

export function analyteLookup(rows: AnalyteInfo[]): Map<string, AnalyteInfo> {
  const map = new Map<string, AnalyteInfo>();
  for (const a of rows) {
    map.set(a.code.toUpperCase(), a);
    if (a.loinc) map.set(a.loinc, a);
  }
  return map;
}

const SEXES: Record<string, 'female' | 'male'> = { f: 'female', female: 'female', m: 'male', male: 'male' };

export function parseSex(text: string): 'female' | 'male' | null {
  return SEXES[text.trim().toLowerCase()] ?? null;
}

/** 'YYYY-MM', or the month of an ISO date or date-time. */
export function parseMonth(text: string): string | null {
  const match = /^(\d{4})-(0[1-9]|1[0-2])(-(0[1-9]|[12]\d|3[01])([T ].*)?)?$/.exec(text.trim());
  return match ? `${match[1]}-${match[2]}` : null;
}

/**
 * The result in the analyte's canonical unit, or the row error saying why not. Messages name the
 * column and the rule, and quote only the measured value and unit (never a patient key).
 */
export function canonicalValue(
  ctx: PatientContext,
  analyte: AnalyteInfo,
  value: number,
  unitText: string,
  at: { row: number; valueColumn: string; unitColumn: string },
): { value: number } | RowError {
  const unit = normalizeUnit(unitText);
  const problem = ctx.units.problemWithUnit(unit);
  if (problem) return { row: at.row, column: at.unitColumn, code: 'invalid_unit', message: problem };
  const conversion = ctx.units.conversion(unit, analyte.unit, analyte.molarMass);
  if ('problem' in conversion)
    return { row: at.row, column: at.unitColumn, code: 'unit_not_convertible', message: conversion.problem };
  const converted = conversion.factor * value + conversion.offset;
  if (
    (analyte.plausibleLow !== null && converted < analyte.plausibleLow) ||
    (analyte.plausibleHigh !== null && converted > analyte.plausibleHigh)
  ) {
    return {
      row: at.row,
      column: at.valueColumn,
      code: 'implausible_value',
      message:
        `${converted} ${analyte.unit} is outside the plausible range of ${analyte.code} ` +
        `(${analyte.plausibleLow ?? '−∞'} to ${analyte.plausibleHigh ?? '∞'} ${analyte.unit})`,
    };
  }
  return { value: converted };
}

export function isSetting(text: string): boolean {
  return (patientSettings as readonly string[]).includes(text);
}
