import type { z } from 'zod';
import { analytes, controlMaterials, instrumentModels, methods, reagents } from '@plumbline/db';
import {
  analyteCreateSchema,
  analyteUpdateSchema,
  controlMaterialCreateSchema,
  controlMaterialUpdateSchema,
  instrumentModelCreateSchema,
  instrumentModelUpdateSchema,
  methodCreateSchema,
  methodUpdateSchema,
  reagentCreateSchema,
  reagentUpdateSchema,
  type CatalogueList,
  type FieldError,
} from '@plumbline/contracts';
import { ucumConversionProblem, ucumUnitProblem } from './ucum.ts';

/** The lists that share one shape: a code, a name, a few descriptive fields and `retiredAt`. */
export type SimpleList = Exclude<CatalogueList, 'control-lots'>;
export type SimpleTable =
  typeof analytes | typeof methods | typeof instrumentModels | typeof reagents | typeof controlMaterials;
export type CatalogueRecord = Record<string, unknown>;

export type SimpleListSpec = {
  list: SimpleList;
  /** Singular name used in audit kinds and entity fields, e.g. 'analyte' → 'catalogue.analyte.create'. */
  entity: string;
  /** Singular name for messages, e.g. 'An analyte'. */
  article: string;
  table: SimpleTable;
  createSchema: z.ZodType;
  updateSchema: z.ZodType;
  /** Editable fields, in the order items list them. */
  fields: readonly string[];
  /** Values a create gets for fields it leaves out. */
  defaults: CatalogueRecord;
  /** Fields `?q=` searches. */
  searchFields: readonly string[];
  /** CSV column → field; `numericColumns` are parsed as numbers. */
  csvColumns: Record<string, string>;
  numericColumns: readonly string[];
  /** Columns whose blank cell means "not given" (the default, or unchanged) rather than "no value". */
  blankNotGivenColumns?: readonly string[];
  /**
   * Checks that need more than one field or a library the contracts do not carry. `changed` lists the
   * fields an edit changes ('all' for a new entry): a rule runs only when its fields are touched, so an
   * older entry that predates a rule can still be renamed.
   */
  check?: (record: CatalogueRecord, changed: readonly string[] | 'all') => FieldError[];
};

const touches = (changed: readonly string[] | 'all', fields: string[]) =>
  changed === 'all' || fields.some((f) => changed.includes(f));

function checkAnalyte(record: CatalogueRecord, changed: readonly string[] | 'all'): FieldError[] {
  const errors: FieldError[] = [];
  const unit = record.unit as string;
  const conventionalUnit = record.conventionalUnit as string | null;
  const molarMass = record.molarMass as number | null;
  const unitProblem = touches(changed, ['unit', 'conventionalUnit', 'molarMass'])
    ? ucumUnitProblem(unit)
    : null;
  if (unitProblem) errors.push({ path: 'unit', message: unitProblem });
  if (conventionalUnit && touches(changed, ['unit', 'conventionalUnit', 'molarMass'])) {
    const problem = ucumUnitProblem(conventionalUnit);
    if (problem) errors.push({ path: 'conventionalUnit', message: problem });
    else if (!unitProblem) {
      const conversion = ucumConversionProblem(conventionalUnit, unit, molarMass);
      if (conversion) errors.push({ path: 'conventionalUnit', message: conversion });
    }
  }
  // A total allowable error is only usable with where it comes from and when that source was read.
  const given = (field: string) => record[field] !== null && record[field] !== undefined;
  const teaGiven = given('teaPct') || given('teaAbsolute');
  if (teaGiven && touches(changed, ['teaPct', 'teaAbsolute', 'teaSource', 'teaDate'])) {
    if (!record.teaSource)
      errors.push({ path: 'teaSource', message: 'give the source of the total allowable error' });
    if (!record.teaDate)
      errors.push({ path: 'teaDate', message: 'give the date of the total allowable error source' });
  }
  // Plausibility limits refuse data at upload: they need a source (or "common practice") and must make a range.
  const limitsGiven = given('plausibleLow') || given('plausibleHigh');
  if (limitsGiven && touches(changed, ['plausibleLow', 'plausibleHigh', 'plausibilitySource'])) {
    if (!record.plausibilitySource)
      errors.push({
        path: 'plausibilitySource',
        message: 'give the source of the plausibility limits, or write "common practice"',
      });
    if (
      given('plausibleLow') &&
      given('plausibleHigh') &&
      !((record.plausibleLow as number) < (record.plausibleHigh as number))
    )
      errors.push({ path: 'plausibleHigh', message: 'the high limit must be above the low limit' });
  }
  return errors;
}

export const simpleListSpecs: Record<SimpleList, SimpleListSpec> = {
  analytes: {
    list: 'analytes',
    entity: 'analyte',
    article: 'An analyte',
    table: analytes,
    createSchema: analyteCreateSchema,
    updateSchema: analyteUpdateSchema,
    fields: [
      'code',
      'name',
      'loinc',
      'unit',
      'conventionalUnit',
      'molarMass',
      'decimals',
      'teaPct',
      'teaAbsolute',
      'teaSource',
      'teaDate',
      'plausibleLow',
      'plausibleHigh',
      'plausibilitySource',
      'allowsNegative',
    ],
    defaults: {
      loinc: null,
      conventionalUnit: null,
      molarMass: null,
      decimals: 2,
      teaPct: null,
      teaAbsolute: null,
      teaSource: null,
      teaDate: null,
      plausibleLow: null,
      plausibleHigh: null,
      plausibilitySource: null,
      allowsNegative: false,
    },
    searchFields: ['code', 'name', 'loinc'],
    csvColumns: {
      code: 'code',
      name: 'name',
      unit: 'unit',
      loinc: 'loinc',
      conventional_unit: 'conventionalUnit',
      molar_mass: 'molarMass',
      decimals: 'decimals',
      tea_pct: 'teaPct',
      tea_absolute: 'teaAbsolute',
      tea_source: 'teaSource',
      tea_date: 'teaDate',
      plausible_low: 'plausibleLow',
      plausible_high: 'plausibleHigh',
      plausibility_source: 'plausibilitySource',
      allows_negative: 'allowsNegative',
    },
    numericColumns: ['molar_mass', 'decimals', 'tea_pct', 'tea_absolute', 'plausible_low', 'plausible_high'],
    blankNotGivenColumns: ['decimals', 'allows_negative'],
    check: checkAnalyte,
  },
  methods: {
    list: 'methods',
    entity: 'method',
    article: 'A method',
    table: methods,
    createSchema: methodCreateSchema,
    updateSchema: methodUpdateSchema,
    fields: ['code', 'name', 'principle'],
    defaults: { principle: null },
    searchFields: ['code', 'name', 'principle'],
    csvColumns: { code: 'code', name: 'name', principle: 'principle' },
    numericColumns: [],
  },
  'instrument-models': {
    list: 'instrument-models',
    entity: 'instrument-model',
    article: 'An instrument model',
    table: instrumentModels,
    createSchema: instrumentModelCreateSchema,
    updateSchema: instrumentModelUpdateSchema,
    fields: ['code', 'name', 'manufacturer'],
    defaults: { manufacturer: null },
    searchFields: ['code', 'name', 'manufacturer'],
    csvColumns: { code: 'code', name: 'name', manufacturer: 'manufacturer' },
    numericColumns: [],
  },
  reagents: {
    list: 'reagents',
    entity: 'reagent',
    article: 'A reagent',
    table: reagents,
    createSchema: reagentCreateSchema,
    updateSchema: reagentUpdateSchema,
    fields: ['code', 'name', 'manufacturer'],
    defaults: { manufacturer: null },
    searchFields: ['code', 'name', 'manufacturer'],
    csvColumns: { code: 'code', name: 'name', manufacturer: 'manufacturer' },
    numericColumns: [],
  },
  'control-materials': {
    list: 'control-materials',
    entity: 'control-material',
    article: 'A control material',
    table: controlMaterials,
    createSchema: controlMaterialCreateSchema,
    updateSchema: controlMaterialUpdateSchema,
    fields: ['code', 'name', 'manufacturer', 'matrix'],
    defaults: { manufacturer: null, matrix: null },
    searchFields: ['code', 'name', 'manufacturer', 'matrix'],
    csvColumns: { code: 'code', name: 'name', manufacturer: 'manufacturer', matrix: 'matrix' },
    numericColumns: [],
  },
};

/** The API shape of a stored row: every editable field, plus the retirement state. */
export function simpleItem(spec: SimpleListSpec, row: CatalogueRecord): CatalogueRecord {
  const item: CatalogueRecord = { id: row.id };
  for (const field of spec.fields) item[field] = row[field] ?? null;
  const retiredAt = row.retiredAt as Date | null;
  item.retiredAt = retiredAt ? retiredAt.toISOString() : null;
  item.retired = retiredAt !== null;
  return item;
}
