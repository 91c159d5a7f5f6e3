import { parse, CsvError } from 'csv-parse';
import { Readable } from 'node:stream';
import { detectDelimiter, firstLine, stripBom, type Delimiter, type RowError } from '@plumbline/contracts';

/** A problem with the file as a whole (not one row): it cannot be read at all. */
export class FileFormatError extends Error {
  constructor(readonly error: RowError) {
    super(error.message);
    this.name = 'FileFormatError';
  }
}

/** One CSV record with the line number (1-based, header = line 1) on which it starts. */
export type CsvRecord = { line: number; cells: string[] };

export type CsvFile = {
  delimiter: Delimiter;
  bom: boolean;
  records: AsyncIterable<CsvRecord>;
};

const SNIFF_BYTES = 64 * 1024;

/**
 * Opens a CSV stream: looks at the start for the byte-order mark and the delimiter, then streams the
 * records through csv-parse (quoted fields, "" escapes, CRLF/LF/CR line ends, blank lines skipped).
 * Only the first chunk or two is held to sniff; the file is never read whole. `onBytes` reports progress.
 */
export async function openCsv(source: Readable, onBytes?: (bytes: number) => void): Promise<CsvFile> {
  const iterator = source[Symbol.asyncIterator]() as AsyncIterator<Buffer>;
  const head: Buffer[] = [];
  let headBytes = 0;
  let ended = false;
  while (headBytes < SNIFF_BYTES) {
    const next = await iterator.next();
    if (next.done) {
      ended = true;
      break;
    }
    head.push(next.value);
    headBytes += next.value.length;
    if (next.value.includes(0x0a) || next.value.includes(0x0d)) break;
  }
  const start = Buffer.concat(head);
  if (
    start.length >= 2 &&
    ((start[0] === 0xff && start[1] === 0xfe) || (start[0] === 0xfe && start[1] === 0xff))
  ) {
    throw new FileFormatError({
      row: 1,
      column: null,
      code: 'malformed_csv',
      message: 'The file is saved as UTF-16. Save it as UTF-8 (CSV UTF-8) and upload it again.',
    });
  }
  const { text, bom } = stripBom(start.toString('utf8'));
  const delimiter = detectDelimiter(firstLine(text));

  async function* bytes(): AsyncGenerator<Buffer> {
    for (const chunk of head) {
      onBytes?.(chunk.length);
      yield chunk;
    }
    if (ended) return;
    while (true) {
      const next = await iterator.next();
      if (next.done) return;
      onBytes?.(next.value.length);
      yield next.value;
    }
  }

  async function* records(): AsyncGenerator<CsvRecord> {
    // csv-parse's own line tracking (`info`) triples its cost per row, so lines are counted here: each
    // record takes one line plus the line breaks inside its quoted fields; blank lines are skipped.
    const parser = Readable.from(bytes()).pipe(
      parse({
        delimiter,
        bom: true,
        relax_column_count: true,
        record_delimiter: ['\r\n', '\n', '\r'],
      }),
    );
    let line = 1;
    try {
      for await (const record of parser as AsyncIterable<string[]>) {
        const start = line;
        let inner = 0;
        for (const value of record) inner += countLineBreaks(value);
        line += 1 + inner;
        if (record.length === 1 && record[0].trim() === '') continue;
        yield { line: start, cells: record };
      }
    } catch (error) {
      if (error instanceof CsvError) {
        const at = (error as CsvError & { lines?: number }).lines ?? line;
        throw new FileFormatError({
          row: at,
          column: null,
          code: 'malformed_csv',
          message: `The file cannot be read as CSV from line ${at}: ${describeCsvError(error)}`,
        });
      }
      throw error;
    }
  }

  return { delimiter, bom, records: records() };
}

function countLineBreaks(value: string): number {
  if (!value.includes('\n') && !value.includes('\r')) return 0;
  return (value.match(/\r\n|\n|\r/g) ?? []).length;
}

function describeCsvError(error: CsvError): string {
  if (error.code === 'CSV_QUOTE_NOT_CLOSED') return 'a quoted field is never closed (a " is missing)';
  if (error.code === 'CSV_INVALID_CLOSING_QUOTE') return 'a quote inside a quoted field must be doubled ("")';
  return error.message;
}
