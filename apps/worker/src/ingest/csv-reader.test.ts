import { describe, expect, it } from 'vitest';
import { Readable } from 'node:stream';
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
