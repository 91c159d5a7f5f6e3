import { describe, expect, it } from 'vitest';
import { rowErrorsCsv, rowErrorsFilename } from './row-errors-csv.ts';

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

  it('when a message or column quotes formula-like text from the file, then it is written as text', () => {
    const text = rowErrorsCsv([
      {
        row: 2,
        column: '=HYPERLINK("http://attacker.invalid")',
        code: 'missing_column',
        message: '@SUM(A1)',
      },
      { row: 3, column: 'lot', code: 'unknown_control_lot', message: '+cmd' },
      { row: 4, column: 'mean', code: 'required', message: '-0.04' },
    ]);
    expect(text.split('\r\n').slice(1, 4)).toEqual([
      `2,"'=HYPERLINK(""http://attacker.invalid"")",missing_column,'@SUM(A1)`,
      "3,lot,unknown_control_lot,'+cmd",
      // A whole cell that is a plain number stays a number (see csvCell in @plumbline/contracts).
      '4,mean,required,-0.04',
    ]);
  });

  it('when the upload has a file name, then the download is named after it', () => {
    expect(rowErrorsFilename('november-summary.csv')).toBe('november-summary-rejected-rows.csv');
    expect(rowErrorsFilename('qc.values.2026-11.txt')).toBe('qc.values.2026-11-rejected-rows.csv');
    expect(rowErrorsFilename('noextension')).toBe('noextension-rejected-rows.csv');
  });
});
