import { describe, expect, it } from 'vitest';
import {
  detectDecimalComma,
  detectDelimiter,
  parseCsvStart,
  stripBom,
  suggestMapping,
} from './csv-format.ts';

describe('detectDelimiter', () => {
  it('when a header line is given, then the most frequent delimiter outside quotes wins', () => {
    expect(detectDelimiter('period,procedure,control_lot')).toBe(',');
    expect(detectDelimiter('period;procedure;control_lot')).toBe(';');
    expect(detectDelimiter('period\tprocedure\tcontrol_lot')).toBe('\t');
    // The commas inside quotes do not count.
    expect(detectDelimiter('"a, b, c";d;e')).toBe(';');
    expect(detectDelimiter('single')).toBe(',');
  });
});

describe('stripBom and detectDecimalComma', () => {
  it('when the text starts with a UTF-8 byte-order mark, then it is removed and reported', () => {
    expect(stripBom('\uFEFFa;b')).toEqual({ text: 'a;b', bom: true });
    expect(stripBom('a;b')).toEqual({ text: 'a;b', bom: false });
  });

  it('when a semicolon file holds numbers like 5,43, then decimal commas are detected; never in comma files', () => {
    expect(detectDecimalComma(';', [['GLU', '5,43']])).toBe(true);
    expect(detectDecimalComma(';', [['GLU', '5.43']])).toBe(false);
    expect(detectDecimalComma(',', [['GLU', '5,43']])).toBe(false);
  });
});

describe('parseCsvStart', () => {
  it('when fields are quoted, then delimiters, quotes and line breaks inside them are kept', () => {
    expect(
      parseCsvStart('a,b\r\n"x, y","say ""hi"""\n"two\nlines",3\n', ',', { maxRows: 10, complete: true }),
    ).toEqual([
      ['a', 'b'],
      ['x, y', 'say "hi"'],
      ['two\nlines', '3'],
    ]);
  });

  it('when the text is only the start of a file, then the cut-off last row is dropped', () => {
    expect(parseCsvStart('a;b\n1;2\n3;4', ';', { maxRows: 10, complete: false })).toEqual([
      ['a', 'b'],
      ['1', '2'],
    ]);
    expect(parseCsvStart('a;b\n1;2\n3;4', ';', { maxRows: 2, complete: true })).toHaveLength(2);
  });
});

describe('suggestMapping', () => {
  it('when headers use the canonical names in another style, then they are matched', () => {
    const suggestion = suggestMapping('qc-summary', [
      'Period',
      'Procedure',
      'Control Lot',
      'Level',
      'N',
      'Mean',
      'SD',
      'Unit',
    ]);
    expect(suggestion.source).toBe('detected');
    expect(suggestion.missing).toEqual([]);
    expect(suggestion.mapping.control_lot).toBe('Control Lot');
  });

  it('when headers are common synonyms, then they are matched and the unmatched required ones listed', () => {
    const suggestion = suggestMapping('qc-values', ['Date', 'Test', 'Lot', 'Result', 'Units']);
    expect(suggestion.mapping).toMatchObject({
      measured_at: 'Date',
      procedure: 'Test',
      control_lot: 'Lot',
      value: 'Result',
      unit: 'Units',
      run: null,
    });
    expect(suggestion.missing).toEqual(['level']);
  });

  it('when the saved mapping fits the headers, then it is used; when it does not, detection takes over', () => {
    const headers = ['Monat', 'Verfahren', 'Charge', 'Stufe', 'Anzahl', 'Mittel', 'Streuung', 'Einheit'];
    const saved = {
      period: 'Monat',
      procedure: 'Verfahren',
      control_lot: 'Charge',
      level: 'Stufe',
      n: 'Anzahl',
      mean: 'Mittel',
      sd: 'Streuung',
      unit: 'Einheit',
    };
    expect(suggestMapping('qc-summary', headers, saved)).toMatchObject({
      source: 'saved',
      missing: [],
      mapping: saved,
    });
    const other = suggestMapping('qc-summary', ['period', 'procedure'], saved);
    expect(other.source).toBe('detected');
    expect(other.missing).toEqual(['control_lot', 'level', 'n', 'mean', 'sd', 'unit']);
  });
});
