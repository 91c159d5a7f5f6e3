import { parse, CsvError } from 'csv-parse';
import { Readable, pipeline } from 'node:stream';
import { StringDecoder } from 'node:string_decoder';
import { detectDelimiter, firstLine, sniffTextFile, stripBom, type Delimiter } from '@plumbline/contracts';
import { textBytes } from './text-bytes.ts';
import { FileFormatError } from './file-format-error.ts';

export { FileFormatError };

/** One CSV record with the line number (1-based, header = line 1) on which it starts. */
export type CsvRecord = { line: number; cells: string[] };

export type CsvFile = {
  delimiter: Delimiter;
  bom: boolean;
  /** The records one by one. */
  records: AsyncIterable<CsvRecord>;
  /** The same records, a chunk of the file at a time (cheaper per record than `records`). */
  batches: AsyncIterable<CsvRecord[]>;
};

const SNIFF_BYTES = 64 * 1024;
/** A record longer than this (a runaway quoted field) is left to csv-parse. */
const MAX_FAST_RECORD_CHARS = 1024 * 1024;

/**
 * Opens a CSV stream: looks at the start for the byte-order mark and the delimiter, then streams the
 * records (quoted fields, "" escapes, CRLF/LF/CR line ends, blank lines skipped). Only the first chunk or
 * two is held to sniff; the file is never read whole. `onBytes` reports progress.
 *
 * With `reopen` (a way to read the file again from its start), well-formed files are split by a small
 * reader of our own, several times faster than csv-parse; at the first thing it does not handle exactly
 * like csv-parse (a stray or unclosed quote, a runaway field) it hands over to csv-parse on the file read
 * again, which skips the records already given and goes on — so the records and errors are always
 * those of csv-parse. Without `reopen`, csv-parse reads the whole file.
 */
export async function openCsv(
  source: Readable,
  onBytes?: (bytes: number) => void,
  reopen?: () => Promise<Readable>,
): Promise<CsvFile> {
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
  const sniffed = sniffTextFile(start, ended);
  if ('problem' in sniffed) {
    throw new FileFormatError({ row: 1, column: null, code: 'not_text', message: sniffed.problem });
  }
  const encoding = sniffed.encoding;
  const { text, bom } = stripBom(new TextDecoder(encoding, { ignoreBOM: true }).decode(start));
  const delimiter = detectDelimiter(firstLine(text));

  async function* rawBytes(): AsyncGenerator<Buffer> {
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
  // Every byte is checked (and Windows-1252 turned into UTF-8) on its way to the CSV readers.
  const bytes = () => textBytes(rawBytes(), encoding);

  async function* batches(): AsyncGenerator<CsvRecord[]> {
    if (!reopen) {
      yield* csvParseBatches(bytes(), delimiter, 1);
      return;
    }
    const reader = new FastCsvReader(delimiter);
    let handOver = false;
    for await (const chunk of bytes()) {
      const batch = reader.push(chunk);
      if (batch.length) yield batch;
      if (reader.irregular) {
        handOver = true;
        break;
      }
    }
    if (!handOver) {
      const batch = reader.end();
      if (batch.length) yield batch;
      handOver = reader.irregular;
    }
    if (handOver) {
      // Stop reading this stream; csv-parse reads the file again and skips what was given.
      await iterator.return?.();
      const again = await reopen();
      yield* csvParseBatches(textBytes(again, encoding), delimiter, reader.nextLine);
    }
  }

  async function* records(): AsyncGenerator<CsvRecord> {
    for await (const batch of batches()) yield* batch;
  }

  return { delimiter, bom, records: records(), batches: batches() };
}

/**
 * Records through csv-parse, in the batches csv-parse gives them; records starting before line `fromLine`
 * are skipped (they were read already). csv-parse's own line tracking (`info`) triples its cost per row,
 * so lines are counted here: each record takes one line plus the line breaks inside its quoted fields;
 * blank lines are skipped.
 */
async function* csvParseBatches(
  source: AsyncIterable<Buffer> | Readable,
  delimiter: Delimiter,
  fromLine: number,
): AsyncGenerator<CsvRecord[]> {
  const parser = parse({
    delimiter,
    bom: true,
    relax_column_count: true,
    record_delimiter: ['\r\n', '\n', '\r'],
  });
  // pipeline (not pipe) so that an error of the source, such as a byte that is not text, reaches the parser.
  pipeline(source instanceof Readable ? source : Readable.from(source), parser, () => {});
  let line = 1;
  let batch: CsvRecord[] = [];
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      const start = line;
      let inner = 0;
      for (const value of record) inner += countLineBreaks(value);
      line += 1 + inner;
      if (start < fromLine) continue;
      if (record.length === 1 && record[0].trim() === '') continue;
      batch.push({ line: start, cells: record });
      if (batch.length >= 1000) {
        yield batch;
        batch = [];
      }
    }
    if (batch.length) yield batch;
  } catch (error) {
    if (batch.length) yield batch;
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
  } finally {
    parser.destroy();
  }
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

const QUOTE = 0x22;
const CR = 0x0d;
const LF = 0x0a;

/**
 * Splits decoded text into records exactly as csv-parse does with our options (delimiter, `bom`,
 * CRLF/LF/CR record delimiters, `"` quotes with "" escapes), for files whose quoting is regular. A
 * record is finished only when its record delimiter has been seen (or at the end of the file). At the
 * first irregularity — a quote inside an unquoted field, anything but a delimiter or line break after a
 * closing quote, a quote still open at the end, a record over MAX_FAST_RECORD_CHARS — it stops and sets
 * `irregular`; `nextLine` is then the line of the first record not given, for csv-parse to go on from.
 */
export class FastCsvReader {
  /** Line on which the next record starts. */
  nextLine = 1;
  irregular = false;
  private readonly decoder = new StringDecoder('utf8');
  private readonly delimiterCode: number;
  private pending = '';
  private first = true;

  constructor(private readonly delimiter: string) {
    this.delimiterCode = delimiter.charCodeAt(0);
  }

  push(chunk: Buffer): CsvRecord[] {
    if (this.irregular) return [];
    return this.split(this.pending + this.decoder.write(chunk), false);
  }

  end(): CsvRecord[] {
    if (this.irregular) return [];
    return this.split(this.pending + this.decoder.end(), true);
  }

  private split(text: string, atEnd: boolean): CsvRecord[] {
    if (this.first && text.length > 0) {
      this.first = false;
      if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
    }
    const records: CsvRecord[] = [];
    const length = text.length;
    const delimiter = this.delimiter;
    let position = 0;
    // Position of the next line feed at or after `position` (-1: none up to the end of the text).
    let lineFeed = -2;
    while (position < length) {
      // Common case: a line without quotes or carriage returns (a CRLF line end aside).
      if (lineFeed !== -1 && lineFeed < position) lineFeed = text.indexOf('\n', position);
      if (lineFeed !== -1) {
        let end = lineFeed;
        if (end > position && text.charCodeAt(end - 1) === CR) end -= 1;
        const line = text.slice(position, end);
        if (line.indexOf('"') === -1 && line.indexOf('\r') === -1) {
          const start = this.nextLine;
          this.nextLine += 1;
          position = lineFeed + 1;
          // A blank line is one empty cell in csv-parse; such records are skipped.
          if (line.length === 0 || (line.indexOf(delimiter) === -1 && line.trim() === '')) continue;
          records.push({ line: start, cells: line.split(delimiter) });
          continue;
        }
      }
      const next = this.record(text, position, atEnd, records);
      if (next === -1) break;
      position = next;
    }
    this.pending = position < length && !this.irregular ? text.slice(position) : '';
    if (this.pending.length > MAX_FAST_RECORD_CHARS) {
      this.irregular = true;
      this.pending = '';
    }
    return records;
  }

  /**
   * Reads one record from `position` character by character. Returns the position after its record
   * delimiter, or -1 when the text ends first (and more may come) or the record is irregular.
   */
  private record(text: string, position: number, atEnd: boolean, records: CsvRecord[]): number {
    const length = text.length;
    const delimiter = this.delimiterCode;
    const cells: string[] = [];
    let breaks = 0;
    let i = position;
    while (true) {
      // One field.
      if (i < length && text.charCodeAt(i) === QUOTE) {
        let value = '';
        let from = i + 1;
        let j = from;
        while (true) {
          if (j >= length) {
            if (atEnd) this.irregular = true; // the quote is never closed
            return -1;
          }
          const c = text.charCodeAt(j);
          if (c === QUOTE) {
            if (j + 1 >= length && !atEnd) return -1; // "" or a closing quote: the next character decides
            if (j + 1 < length && text.charCodeAt(j + 1) === QUOTE) {
              value += text.slice(from, j + 1);
              j += 2;
              from = j;
              continue;
            }
            value += text.slice(from, j);
            j += 1;
            break;
          }
          if (c === LF) breaks += 1;
          else if (c === CR) {
            if (j + 1 >= length && !atEnd) return -1; // a CR LF pair may be split between chunks
            if (!(j + 1 < length && text.charCodeAt(j + 1) === LF)) breaks += 1;
          }
          j += 1;
        }
        cells.push(value);
        i = j;
        if (i >= length) {
          if (!atEnd) return -1;
          return this.finish(records, cells, breaks, i);
        }
        const c = text.charCodeAt(i);
        if (c === delimiter) {
          i += 1;
          continue;
        }
        if (c === LF) return this.finish(records, cells, breaks, i + 1);
        if (c === CR) {
          if (i + 1 >= length && !atEnd) return -1;
          return this.finish(
            records,
            cells,
            breaks,
            i + 1 < length && text.charCodeAt(i + 1) === LF ? i + 2 : i + 1,
          );
        }
        this.irregular = true; // something other than a delimiter or line break after a closing quote
        return -1;
      }
      let j = i;
      while (j < length) {
        const c = text.charCodeAt(j);
        if (c === delimiter || c === LF || c === CR) break;
        if (c === QUOTE) {
          this.irregular = true; // a quote inside an unquoted field
          return -1;
        }
        j += 1;
      }
      if (j >= length && !atEnd) return -1;
      cells.push(text.slice(i, j));
      if (j >= length) return this.finish(records, cells, breaks, j);
      const c = text.charCodeAt(j);
      if (c === delimiter) {
        i = j + 1;
        continue;
      }
      if (c === LF) return this.finish(records, cells, breaks, j + 1);
      // CR: alone, or the first half of CR LF.
      if (j + 1 >= length && !atEnd) return -1;
      return this.finish(
        records,
        cells,
        breaks,
        j + 1 < length && text.charCodeAt(j + 1) === LF ? j + 2 : j + 1,
      );
    }
  }

  private finish(records: CsvRecord[], cells: string[], breaks: number, next: number): number {
    const start = this.nextLine;
    this.nextLine += 1 + breaks;
    if (!(cells.length === 1 && cells[0].trim() === '')) records.push({ line: start, cells });
    return next;
  }
}
