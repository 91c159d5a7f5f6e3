import { describe, expect, it } from 'vitest';
import { identifierInCell, identifierInHeader } from './identifiers.ts';
import { wholeYears } from './fhir-bundle.ts';
import { parseMonth } from './patient-rows.ts';

// The kinds are the direct identifiers of the HIPAA Safe Harbor list (from memory); the header spellings
// are common practice in laboratory exports, invented here.
describe('direct identifiers in column names', () => {
  it.each([
    ['Patient Name', 'name'],
    ['surname', 'name'],
    ['MRN', 'medical record number'],
    ['patient_id', 'medical record number'],
    ['DOB', 'full birth date'],
    ['Date of birth', 'full birth date'],
    ['street_address', 'street address'],
    ['Home address', 'street address'],
    ['Phone', 'phone number'],
    ['mobile', 'phone number'],
    ['E-mail', 'e-mail address'],
    ['SSN', 'national id'],
    ['national_id', 'national id'],
  ])('when a column is called "%s", then it is a %s', (header, kind) => {
    expect(identifierInHeader(header)).toBe(kind);
  });

  it.each([
    'analyte',
    'value',
    'unit',
    'sex',
    'age_years',
    'collected_month',
    'setting',
    'sample_id',
    'comment',
  ])('when a column is the harmless "%s", then it is no identifier', (header) =>
    expect(identifierInHeader(header)).toBeNull(),
  );
});

describe('identifiers by content', () => {
  it('when a cell holds an e-mail address or a phone number, then it is found in any column', () => {
    expect(identifierInCell('sample_id', 'someone@example.org')).toBe('e-mail address');
    expect(identifierInCell('comment', '+44 20 7946 0381')).toBe('phone number');
    expect(identifierInCell('comment', '(555) 014-2298')).toBe('phone number');
  });
  it('when a full date stands outside collected_month, then it counts as a birth date; inside, it does not', () => {
    expect(identifierInCell('comment', '1961-04-17')).toBe('full birth date');
    expect(identifierInCell('comment', '17.04.1961')).toBe('full birth date');
    expect(identifierInCell('collected_month', '2026-02-14')).toBeNull();
  });
  it('when cells hold ordinary results, then nothing is flagged', () => {
    for (const [column, value] of [
      ['value', '140'],
      ['value', '0.92'],
      ['age_years', '66'],
      ['sample_id', 'K-20417'],
      ['collected_month', '2026-02'],
    ])
      expect(identifierInCell(column, value)).toBeNull();
  });
});

describe('whole years at collection', () => {
  it('when the birthday has or has not yet come in the year of collection, then the age counts it or not', () => {
    // Common practice: age in completed years.
    expect(wholeYears('1980-06-15', '2026-06-14T08:00:00Z')).toBe(45);
    expect(wholeYears('1980-06-15', '2026-06-15')).toBe(46);
    expect(wholeYears('1980-06', '2026-06-15')).toBeNull();
  });
  it('when a collection date is a month or a full date, then only its month is kept', () => {
    expect(parseMonth('2026-02-14')).toBe('2026-02');
    expect(parseMonth('2026-02')).toBe('2026-02');
    expect(parseMonth('2026-13')).toBeNull();
  });
});
