import { describe, expect, it } from 'vitest';
import { Readable } from 'node:stream';
import fc from 'fast-check';
import { FileFormatError, openCsv, type CsvRecord } from './csv-reader.ts';

async function readAll(text: string | Buffer, chunkSize = 7) {
  const bytes = typeof text === 'string' ? Buffer.from(text, 'utf8') : text;
  const chunks: Buffer[] = [];
  for (let i = 0; i < bytes.length; i += chunkSize) chunks.push(bytes.subarray(i, i + chunkSize));
  const csv = await openCsv(Readable.from(chunks));
  const records: CsvRecord[] = [];
  for await (const r of csv.records) records.push(r);
  return { delimiter: csv.delimiter, bom: csv.bom, records };
}

describe('openCsv', () => {
  it('when a semicolon file has a BOM and CRLF line ends, then the delimiter and cells are read', async () => {
    const { delimiter, bom, records } = await readAll('\uFEFFperiod;mean\r\n2026-03;5,43\r\n');
    expect(delimiter).toBe(';');
    expect(bom).toBe(true);
    expect(records).toEqual([
      { line: 1, cells: ['period', 'mean'] },
      { line: 2, cells: ['2026-03', '5,43'] },
    ]);
  });

  it('when a quoted field spans lines and blank lines occur, then each record keeps the line it starts on', async () => {
    const { records } = await readAll('a,b\n1,"two\nlines"\n\n3,"say ""hi"""\n');
    expect(records).toEqual([
      { line: 1, cells: ['a', 'b'] },
      { line: 2, cells: ['1', 'two\nlines'] },
      { line: 5, cells: ['3', 'say "hi"'] },
    ]);
  });

  it('when the file is tab-separated, then tabs split the cells', async () => {
    const { delimiter, records } = await readAll('a\tb\n1\t2');
    expect(delimiter).toBe('\t');
    expect(records[1].cells).toEqual(['1', '2']);
  });

  it('when a quote is never closed, then the file is refused with the line number', async () => {
    const error = await readAll('a,b\n1,2\n3,"open\n4,5\n').catch((e: unknown) => e);
    expect(error).toBeInstanceOf(FileFormatError);
    expect((error as FileFormatError).error).toMatchObject({ code: 'malformed_csv', column: null });
    expect((error as FileFormatError).error.message).toMatch(/never closed/);
  });

  it('when the file is UTF-16, then it is refused with a way to fix it', async () => {
    const utf16 = Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('a,b\n', 'utf16le')]);
    const error = await readAll(utf16).catch((e: unknown) => e);
    expect((error as FileFormatError).error.message).toMatch(/UTF-16.*UTF-8/);
  });
});

describe('openCsv, own reader for well-formed files', () => {
  /** Records (or the error) as read with our reader (a way to reopen the file given) and with csv-parse alone. */
  async function bothWays(bytes: Buffer, chunkSize: number) {
    const chunks = () => {
      const list: Buffer[] = [];
      for (let i = 0; i < bytes.length; i += chunkSize) list.push(bytes.subarray(i, i + chunkSize));
      return Readable.from(list);
    };
    let reopened = 0;
    const read = async (reopen?: () => Promise<Readable>) => {
      try {
        const csv = await openCsv(chunks(), undefined, reopen);
        const records: CsvRecord[] = [];
        for await (const r of csv.records) records.push(r);
        return { delimiter: csv.delimiter, bom: csv.bom, records };
      } catch (error) {
        // Records read before an error do not matter: the file is refused as a whole.
        return { error: error instanceof FileFormatError ? error.error : String(error) };
      }
    };
    const own = await read(async () => {
      reopened += 1;
      return chunks();
    });
    const reference = await read();
    return { own, reference, reopened };
  }

  // Cells that exercise quoting ("" escapes, delimiters and line breaks inside quotes), empty cells,
  // blanks, non-ASCII text split across chunks; rows ended by LF, CRLF or CR; sometimes a BOM.
  const cell = fc.constantFrom(
    'a',
    'bc',
    '12.5',
    '',
    ' ',
    '"q,w"',
    '"a\nb"',
    '"x""y"',
    '""',
    '"r\r\ns"',
    '"\r"',
    'é😀',
    'x;y',
    't\tu',
  );
  const file = fc
    .record({
      bom: fc.boolean(),
      delimiter: fc.constantFrom(',', ';', '\t'),
      end: fc.constantFrom('\n', '\r\n', '\r'),
      rows: fc.array(fc.array(cell, { minLength: 1, maxLength: 4 }), { minLength: 1, maxLength: 12 }),
      lastEnd: fc.boolean(),
      blankLines: fc.boolean(),
    })
    .map(({ bom, delimiter, end, rows, lastEnd, blankLines }) => {
      const lines = rows.map((r) => r.join(delimiter));
      if (blankLines) lines.splice(1, 0, '');
      return (bom ? '\uFEFF' : '') + lines.join(end) + (lastEnd ? end : '');
    });

  it('when a file is well formed, then our reader gives exactly the records csv-parse gives (csv-parse as reference, property test)', async () => {
    await fc.assert(
      fc.asyncProperty(file, fc.integer({ min: 1, max: 9 }), async (text, chunkSize) => {
        const { own, reference, reopened } = await bothWays(Buffer.from(text, 'utf8'), chunkSize);
        expect(own).toEqual(reference);
        // No hand-over to csv-parse when the file reads without error (a file can still be broken when the
        // first line, which sets the delimiter, has none of the delimiter used below it).
        if (!('error' in reference)) expect(reopened).toBe(0);
      }),
      { numRuns: 500 },
    );
  });

  it('when the quoting is broken anywhere, then the file is handed to csv-parse and refused with its error (property test)', async () => {
    const noise = fc.constantFrom('"', 'a"b', '"x"y', '"open', '\n', ',', 'z');
    const broken = fc
      .tuple(file, fc.array(noise, { minLength: 1, maxLength: 3 }), fc.nat())
      .map(([text, parts, at]) => {
        const cut = at % (text.length + 1);
        return text.slice(0, cut) + parts.join('') + text.slice(cut);
      });
    await fc.assert(
      fc.asyncProperty(broken, fc.integer({ min: 1, max: 9 }), async (text, chunkSize) => {
        const { own, reference } = await bothWays(Buffer.from(text, 'utf8'), chunkSize);
        expect(own).toEqual(reference);
      }),
      { numRuns: 500 },
    );
  });
});
