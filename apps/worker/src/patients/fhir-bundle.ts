import type { Bundle, Observation, Patient } from 'fhir/r4.js';
import { z } from 'zod';
import type { RowError } from '@plumbline/contracts';
import { FileFormatError } from '../ingest/csv-reader.ts';
import { identifierInCell, identifierMessage, type IdentifierKind } from './identifiers.ts';
import { IdentifierRefusal, addRowErrors, type PatientRead } from './patient-csv.ts';
import { canonicalValue, hashSampleKey, isSetting, parseMonth, type PatientContext } from './patient-rows.ts';

/** Our own extension on an Observation naming the care setting (outpatient when absent). */
export const CARE_SETTING_EXTENSION = 'urn:plumbline:fhir:care-setting';
const LOINC = 'http://loinc.org';

// Only the parts of the FHIR R4 structures that are read are validated; the rest passes through.
const codingSchema = z.object({ system: z.string().optional(), code: z.string().optional() }).passthrough();
const observationSchema = z
  .object({
    resourceType: z.literal('Observation'),
    code: z.object({ coding: z.array(codingSchema).optional() }).passthrough(),
    valueQuantity: z
      .object({ value: z.number().optional(), unit: z.string().optional(), code: z.string().optional() })
      .passthrough()
      .optional(),
    effectiveDateTime: z.string().optional(),
    subject: z.object({ reference: z.string().optional() }).passthrough().optional(),
    extension: z
      .array(z.object({ url: z.string(), valueCode: z.string().optional() }).passthrough())
      .optional(),
  })
  .passthrough();
const patientSchema = z
  .object({
    resourceType: z.literal('Patient'),
    id: z.string().optional(),
    gender: z.string().optional(),
    birthDate: z.string().optional(),
  })
  .passthrough();
const bundleSchema = z
  .object({
    resourceType: z.literal('Bundle'),
    entry: z
      .array(
        z
          .object({
            fullUrl: z.string().optional(),
            resource: z.object({ resourceType: z.string() }).passthrough(),
          })
          .passthrough(),
      )
      .min(1, 'the Bundle has no entries'),
  })
  .passthrough();

/** Patient elements that are direct identifiers, and the kind each is. */
const PATIENT_IDENTIFIER_ELEMENTS: [string, IdentifierKind][] = [
  ['name', 'name'],
  ['identifier', 'medical record number'],
  ['telecom', 'phone number'],
  ['address', 'street address'],
  ['contact', 'name'],
  ['photo', 'name'],
];

const invalid = (message: string, row = 1, column: string | null = null) =>
  new FileFormatError({ row, column, code: 'invalid_fhir', message });

/**
 * Reads a FHIR R4 Bundle of Observations and their Patients. A Patient element that is a direct
 * identifier (name, identifier, telecom, address, contact, photo), a subject display, or any text that
 * looks like an e-mail address or phone number refuses the whole Bundle. Ages are whole years at
 * collection from birthDate, which is then dropped; only the month of effectiveDateTime is kept. Row
 * numbers of errors are entry positions (1 = the first entry).
 */
export function readFhirBundle(ctx: PatientContext, text: string): PatientRead {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch {
    throw invalid('The file is not valid JSON, so it cannot be read as a FHIR Bundle.');
  }
  const parsed = bundleSchema.safeParse(json);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw invalid(
      `The file is not a FHIR R4 Bundle: ${issue.path.join('.') || 'the top level'}: ${issue.message}.`,
    );
  }
  const bundle = parsed.data as unknown as Bundle;
  const entries = bundle.entry ?? [];
  scanForIdentifiers(entries);

  const patients = new Map<string, { patient: Patient; at: number }>();
  entries.forEach((entry, i) => {
    const resource = entry.resource;
    if (resource?.resourceType !== 'Patient') return;
    const patient = patientSchema.safeParse(resource);
    if (!patient.success) return;
    const p = patient.data as unknown as Patient;
    if (entry.fullUrl) patients.set(entry.fullUrl, { patient: p, at: i + 1 });
    if (p.id) patients.set(`Patient/${p.id}`, { patient: p, at: i + 1 });
  });

  const result: PatientRead = { rowsTotal: 0, rows: [], errors: [], errorsTotal: 0, rowsRejected: 0 };
  entries.forEach((entry, i) => {
    if (entry.resource?.resourceType !== 'Observation') return;
    result.rowsTotal += 1;
    const errors = readObservation(ctx, entry.resource as Observation, i + 1, patients, result);
    if (errors.length) {
      result.rowsRejected += 1;
      addRowErrors(result, errors);
    }
  });
  if (result.rowsTotal === 0) throw invalid('The Bundle holds no Observation.');
  return result;
}

function scanForIdentifiers(entries: NonNullable<Bundle['entry']>) {
  entries.forEach((entry, i) => {
    const resource = entry.resource as Record<string, unknown> | undefined;
    if (!resource) return;
    const where = (element: string) =>
      `the element entry[${i}].resource.${element} (${resource.resourceType})`;
    if (resource.resourceType === 'Patient') {
      for (const [element, kind] of PATIENT_IDENTIFIER_ELEMENTS) {
        if (resource[element] !== undefined)
          throw new IdentifierRefusal({
            row: i + 1,
            column: `Patient.${element}`,
            code: 'direct_identifier',
            message: identifierMessage(where(element), kind),
          });
      }
    }
    const subject = resource.subject as Record<string, unknown> | undefined;
    if (subject && (subject.display !== undefined || subject.identifier !== undefined)) {
      const element = subject.display !== undefined ? 'subject.display' : 'subject.identifier';
      throw new IdentifierRefusal({
        row: i + 1,
        column: `Observation.${element}`,
        code: 'direct_identifier',
        message: identifierMessage(
          where(element),
          element === 'subject.display' ? 'name' : 'medical record number',
        ),
      });
    }
    // Any text anywhere that looks like an e-mail address or a phone number.
    walkStrings(resource, '', (path, value) => {
      if (path.endsWith('birthDate') || /effective|issued|DateTime|date$/i.test(path)) return;
      // FHIR is full of dates (meta, issued, periods); the birth date is Patient.birthDate, read and dropped.
      const kind = identifierInCell('value', value);
      if (kind && kind !== 'full birth date')
        throw new IdentifierRefusal({
          row: i + 1,
          column: path,
          code: 'direct_identifier',
          message: identifierMessage(where(path), kind, true),
        });
    });
  });
}

function walkStrings(node: unknown, path: string, visit: (path: string, value: string) => void) {
  if (typeof node === 'string') visit(path, node);
  else if (Array.isArray(node)) node.forEach((item, i) => walkStrings(item, `${path}[${i}]`, visit));
  else if (node && typeof node === 'object')
    for (const [key, value] of Object.entries(node)) walkStrings(value, path ? `${path}.${key}` : key, visit);
}

function readObservation(
  ctx: PatientContext,
  resource: Observation,
  row: number,
  patients: Map<string, { patient: Patient; at: number }>,
  out: PatientRead,
): RowError[] {
  const checked = observationSchema.safeParse(resource);
  if (!checked.success) {
    const issue = checked.error.issues[0];
    return [
      { row, column: `Observation.${issue.path.join('.')}`, code: 'invalid_fhir', message: issue.message },
    ];
  }
  const obs = resource;
  const error = (column: string, code: RowError['code'], message: string): RowError[] => [
    { row, column, code, message },
  ];
  const loinc = obs.code.coding?.find((c) => c.system === LOINC)?.code;
  if (!loinc) return error('Observation.code', 'unknown_analyte', 'the Observation has no LOINC code');
  const analyte = ctx.analytes.get(loinc);
  if (!analyte)
    return error('Observation.code', 'unknown_analyte', `LOINC ${loinc} is not an analyte of the catalogue`);
  const quantity = obs.valueQuantity;
  if (!quantity || typeof quantity.value !== 'number' || !Number.isFinite(quantity.value))
    return error(
      'Observation.valueQuantity',
      'invalid_number',
      'the Observation has no numeric valueQuantity',
    );
  const unit = quantity.code ?? quantity.unit;
  if (!unit) return error('Observation.valueQuantity', 'invalid_unit', 'the valueQuantity has no UCUM code');
  const effective = obs.effectiveDateTime ?? '';
  const month = parseMonth(effective);
  if (!month)
    return error('Observation.effectiveDateTime', 'invalid_period', 'effectiveDateTime must be a date');
  const reference = obs.subject?.reference;
  const found = reference ? patients.get(reference) : undefined;
  if (!found) return error('Observation.subject', 'required', 'the subject is not a Patient of this Bundle');
  const gender = found.patient.gender;
  if (gender !== 'female' && gender !== 'male')
    return error(
      'Patient.gender',
      'invalid_sex',
      'Patient.gender must be female or male for a partitioned study',
    );
  const age = wholeYears(found.patient.birthDate, effective);
  if (age === null || age < 0 || age > 120)
    return error('Patient.birthDate', 'invalid_age', 'birthDate must be a full date before the collection');
  const settingCode = obs.extension?.find((e) => e.url === CARE_SETTING_EXTENSION)?.valueCode ?? 'outpatient';
  if (!isSetting(settingCode))
    return error(
      'Observation.extension',
      'invalid_setting',
      'the care setting must be outpatient, inpatient, screening or emergency',
    );
  const converted = canonicalValue(ctx, analyte, quantity.value, unit, {
    row,
    valueColumn: 'Observation.valueQuantity.value',
    unitColumn: 'Observation.valueQuantity.code',
  });
  if (!('value' in converted)) return [converted];
  out.rows.push({
    analyteId: analyte.id,
    value: converted.value,
    sex: gender,
    ageYears: age,
    collectedMonth: month,
    setting: settingCode,
    sampleHash: hashSampleKey(ctx.salt, ctx.labId, reference!),
  });
  return [];
}

/** Whole years from a full birth date to the collection date (birthdays counted on the day). */
export function wholeYears(birthDate: string | undefined, collected: string): number | null {
  const birth = /^(\d{4})-(\d{2})-(\d{2})$/.exec(birthDate ?? '');
  const at = /^(\d{4})-(\d{2})-(\d{2})/.exec(collected);
  if (!birth || !at) return null;
  const [by, bm, bd] = birth.slice(1).map(Number);
  const [cy, cm, cd] = at.slice(1).map(Number);
  return cy - by - (cm < bm || (cm === bm && cd < bd) ? 1 : 0);
}
