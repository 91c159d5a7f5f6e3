/**
 * Direct patient identifiers. A file that carries one is refused whole; nothing of it is kept. The
 * checks look at column names (and FHIR element names) and, as a second line, at what a cell holds.
 * The lists are common practice for de-identification (the HIPAA Safe Harbor list of direct
 * identifiers, from memory), not an exhaustive standard.
 */

export type IdentifierKind =
  | 'name'
  | 'medical record number'
  | 'full birth date'
  | 'street address'
  | 'phone number'
  | 'e-mail address'
  | 'national id';

/** Why such a column may not be uploaded, in words the user reads. */
export const identifierReasons: Record<IdentifierKind, string> = {
  name: 'a person’s name identifies the patient directly',
  'medical record number': 'a medical record number identifies the patient directly',
  'full birth date': 'a full birth date identifies the patient; send the age in whole years instead',
  'street address': 'a street address identifies the patient directly',
  'phone number': 'a phone number identifies the patient directly',
  'e-mail address': 'an e-mail address identifies the patient directly',
  'national id': 'a national identity or insurance number identifies the patient directly',
};

const normalise = (header: string) =>
  header
    .trim()
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '');

const HEADER_PATTERNS: [IdentifierKind, RegExp][] = [
  [
    'name',
    /^(patient_|pt_|first_|last_|given_|family_|full_|sur|middle_|maiden_)?names?$|^(forename|surname|family|given)$/,
  ],
  [
    'medical record number',
    /(^|_)(mrn|mr_number|medical_record(_number|_no)?|record_number|chart_number|patient_(id|number|no)|hospital_number)($|_)/,
  ],
  ['full birth date', /(^|_)(dob|birth_?date|date_of_birth|birthday|born(_on)?)($|_)/],
  ['street address', /(^|_)(address|street|street_address|addr|postal_address|home_address|residence)($|_)/],
  ['phone number', /(^|_)(phone|telephone|tel|mobile|cell|fax|phone_number)($|_)/],
  ['e-mail address', /(^|_)(e_?mail|email_address|mail)($|_)/],
  [
    'national id',
    /(^|_)(ssn|social_security(_number)?|national_id|nationalid|national_number|nhs_number|insurance_number|passport(_number)?|id_card|personal_number|tax_id)($|_)/,
  ],
];

/** The kind of direct identifier a column name stands for, or null. */
export function identifierInHeader(header: string): IdentifierKind | null {
  const name = normalise(header);
  if (name === '') return null;
  for (const [kind, pattern] of HEADER_PATTERNS) if (pattern.test(name)) return kind;
  return null;
}

const EMAIL = /[^\s@]+@[^\s@]+\.[a-z]{2,}/i;
// Seven or more digits in a phone layout: +country, brackets, spaces, dots or dashes between groups.
const PHONE = /^\+?\(?\d{1,4}\)?([ .-]\d{1,5}){2,5}$/;
const ISO_DATE = /^\d{4}-\d{2}(-\d{2})?([T ].*)?$/;
// An ISO calendar date with a day (YYYY-MM-DD) or a day-first/month-first date (DD/MM/YYYY).
const FULL_DATE = /^(\d{4}-\d{2}-\d{2}|\d{1,2}[./]\d{1,2}[./]\d{4})/;

/**
 * The kind of identifier a cell's content looks like, or null. `column` is the canonical column the cell
 * belongs to: a full date is expected in collected_month (it is cut to its month) but not elsewhere.
 */
export function identifierInCell(column: string, value: string): IdentifierKind | null {
  const text = value.trim();
  if (text === '') return null;
  if (EMAIL.test(text)) return 'e-mail address';
  // Dates first: a dotted date would otherwise read as a phone number.
  if (FULL_DATE.test(text) || ISO_DATE.test(text))
    return column !== 'collected_month' && FULL_DATE.test(text) ? 'full birth date' : null;
  const digits = text.replace(/\D/g, '').length;
  if (column !== 'value' && column !== 'age_years' && digits >= 7 && PHONE.test(text)) return 'phone number';
  return null;
}

/** The refusal message for a column (or element) that carries an identifier; never quotes a value. */
export function identifierMessage(where: string, kind: IdentifierKind, content = false): string {
  return (
    `The file was refused and nothing of it was kept: ${where} ${content ? 'holds what looks like' : 'is'} ` +
    `${/^[aeiou]/.test(kind) ? 'an' : 'a'} ${kind} — ${identifierReasons[kind]}. Remove it and upload the file again.`
  );
}
