import { describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { csvCell, toCsv } from './csv-format.ts';

// Sources:
// - OWASP, "CSV Injection" (owasp.org/www-community/attacks/CSV_Injection): cells beginning with
//   = + - @ tab or carriage return are read as formulas; prepend a single quote to neutralise them.
// - RFC 4180, "Common Format and MIME Type for CSV Files", §2: fields holding a comma, double quote,
//   CR or LF are enclosed in double quotes; a double quote inside is escaped by another one; CRLF ends lines.
// Expected strings below follow those rules by hand; csv-parse (a general-purpose CSV reader) reads the
// written text back to confirm the quoting round-trips.

describe('one CSV cell', () => {
  it('when text begins with a formula character, then it gets a leading apostrophe (OWASP)', () => {
    expect(csvCell('=HYPERLINK("http://attacker.invalid","x")')).toBe(
      `"'=HYPERLINK(""http://attacker.invalid"",""x"")"`,
    );
    expect(csvCell('+cmd')).toBe("'+cmd");
    expect(csvCell('-2+3+cmd')).toBe("'-2+3+cmd");
    expect(csvCell('@SUM(A1:A9)')).toBe("'@SUM(A1:A9)");
    expect(csvCell('\tTAB')).toBe("'\tTAB");
    expect(csvCell('\r=1+1')).toBe(`"'\r=1+1"`);
  });

  it('when a cell is a plain number, then it stays a number, negative or not', () => {
    expect(csvCell(-1.5)).toBe('-1.5');
    expect(csvCell('-1.5')).toBe('-1.5');
    expect(csvCell('+2')).toBe('+2');
    expect(csvCell(3.2e-5)).toBe('0.000032');
    expect(csvCell('-3.2e-5')).toBe('-3.2e-5');
    // A true minus sign in front of a figure (as the web app formats them) is written as ASCII.
    expect(csvCell('\u22120.40')).toBe('-0.40');
  });

  it('when text only looks numeric at its start, then it is neutralised', () => {
    expect(csvCell('-1.5+A1')).toBe("'-1.5+A1");
    expect(csvCell('-')).toBe("'-");
    expect(csvCell('- a note')).toBe("'- a note");
  });

  it('when text holds a comma, quote or line break, then it is quoted with quotes doubled (RFC 4180)', () => {
    expect(csvCell('a,b')).toBe('"a,b"');
    expect(csvCell('say "hi"')).toBe('"say ""hi"""');
    expect(csvCell('two\nlines')).toBe('"two\nlines"');
    expect(csvCell('plain')).toBe('plain');
  });

  it('when a cell is empty or a yes/no, then it is written as empty or yes/no', () => {
    expect(csvCell(null)).toBe('');
    expect(csvCell(undefined)).toBe('');
    expect(csvCell(true)).toBe('yes');
    expect(csvCell(false)).toBe('no');
  });
});

describe('a CSV text', () => {
  it('when written and read back, then every cell round-trips, neutralised cells with their apostrophe', () => {
    const text = toCsv(
      ['comment', 'sdi'],
      [
        ['=HYPERLINK("http://attacker.invalid")', -1.25],
        ['fine, "quoted"\nand multiline', 0.5],
      ],
    );
    expect(text.endsWith('\r\n')).toBe(true);
    expect(text.split('\r\n')[0]).toBe('comment,sdi');
    const rows: string[][] = parse(text);
    expect(rows).toEqual([
      ['comment', 'sdi'],
      [`'=HYPERLINK("http://attacker.invalid")`, '-1.25'],
      ['fine, "quoted"\nand multiline', '0.5'],
    ]);
  });
});
