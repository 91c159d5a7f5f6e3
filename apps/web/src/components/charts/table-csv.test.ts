import { describe, expect, it } from 'vitest';
import { csvCell, tableCsv } from './table-csv.ts';

// RFC 4180 §2: fields with commas, quotes or line breaks are enclosed in double quotes, and a quote
// inside is doubled; records end with CRLF.
describe('table CSV', () => {
  it('when a cell holds a comma, quote or line break, then it is quoted and inner quotes doubled (RFC 4180 §2.6, §2.7)', () => {
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
  });

  it('when a figure is signed, then it stays a figure with an ASCII minus; formula-like text is defused', () => {
    expect(csvCell('\u22120.40')).toBe('-0.40');
    expect(csvCell('+2.50')).toBe('+2.50');
    expect(csvCell('=SUM(A1)')).toBe("'=SUM(A1)");
    expect(csvCell('-cmd')).toBe("'-cmd");
  });

  it('when a table is written, then each record ends with CRLF (RFC 4180 §2.1)', () => {
    expect(
      tableCsv(
        ['Lab', 'SDI'],
        [
          ['Your lab', '+2.50'],
          ['Other lab 1', null],
        ],
      ),
    ).toBe('Lab,SDI\r\nYour lab,+2.50\r\nOther lab 1,\r\n');
  });
});
