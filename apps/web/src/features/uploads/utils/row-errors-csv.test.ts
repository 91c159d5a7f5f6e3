import { describe, expect, it } from 'vitest';
import { csvCell, rowErrorsCsv, rowErrorsFilename } from './row-errors-csv.ts';

// Quoting rules: RFC 4180 §2 (fields with commas, quotes or line breaks are enclosed in double quotes,
// a quote inside is doubled; lines end in CRLF). The apostrophe before = + - @ is the OWASP "CSV
// injection" advice for text a spreadsheet would otherwise run as a formula.
describe('rejected rows as CSV', () => {
  it('when messages hold commas, quotes and line breaks, then those cells are quoted per RFC 4180', () => {
    const text = rowErrorsCsv([
      { row: 4, column: 'Std dev', code: 'sd_not_positive', message: 'The SD must be > 0, found "-0.04".' },
      { row: 9, column: null, code: 'malformed_csv', message: 'A quote opened on line 9\nis never closed.' },
    ]);
    expect(text).toBe(
      'line,column,code,message\r\n' +
        '4,Std dev,sd_not_positive,"The SD must be > 0, found ""-0.04""."\r\n' +
        '9,,malformed_csv,"A quote opened on line 9\nis never closed."\r\n',
    );
  });

  it('when a cell starts like a spreadsheet formula, then it is written as text', () => {
    expect(csvCell('=SUM(A1:A9)')).toBe("'=SUM(A1:A9)");
    expect(csvCell('@cmd')).toBe("'@cmd");
    expect(csvCell('-0.04')).toBe("'-0.04");
    expect(csvCell(-3)).toBe('-3');
    expect(csvCell('Lot')).toBe('Lot');
  });

  it('when the upload has a file name, then the download is named after it', () => {
    expect(rowErrorsFilename('november-summary.csv')).toBe('november-summary-rejected-rows.csv');
    expect(rowErrorsFilename('qc.values.2026-11.txt')).toBe('qc.values.2026-11-rejected-rows.csv');
    expect(rowErrorsFilename('noextension')).toBe('noextension-rejected-rows.csv');
  });
});
