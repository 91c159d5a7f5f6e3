import { isUtf8 } from 'node:buffer';
import { completeUtf8Length, type TextEncoding } from '@plumbline/contracts';
import { FileFormatError } from './file-format-error.ts';

const notText = (message: string) => new FileFormatError({ row: 1, column: null, code: 'not_text', message });

/**
 * Passes a file's bytes on as UTF-8, checking every chunk: a NUL byte or a byte sequence that is not
 * UTF-8 anywhere in the file stops it with a FileFormatError. A Windows-1252 file is decoded and passed on
 * re-encoded as UTF-8. Any upload kind can read its file through this.
 */
export async function* textBytes(
  source: AsyncIterable<Buffer>,
  encoding: TextEncoding,
): AsyncGenerator<Buffer> {
  let offset = 0;
  if (encoding === 'windows-1252') {
    const decoder = new TextDecoder('windows-1252');
    for await (const chunk of source) {
      const nul = chunk.indexOf(0);
      if (nul !== -1) throw nulError(offset + nul);
      offset += chunk.length;
      yield Buffer.from(decoder.decode(chunk, { stream: true }), 'utf8');
    }
    return;
  }
  // A multi-byte character may be split between chunks: its first bytes wait for the next chunk.
  let carry: Buffer = Buffer.alloc(0);
  for await (const chunk of source) {
    const nul = chunk.indexOf(0);
    if (nul !== -1) throw nulError(offset + nul);
    const bytes = carry.length ? Buffer.concat([carry, chunk]) : chunk;
    const complete = completeUtf8Length(bytes);
    if (!isUtf8(bytes.subarray(0, complete)))
      throw notUtf8(offset - carry.length, bytes.subarray(0, complete));
    offset += chunk.length;
    carry = Buffer.from(bytes.subarray(complete));
    yield chunk;
  }
  if (carry.length && !isUtf8(carry)) throw notUtf8(offset - carry.length, carry);
}

function nulError(at: number): FileFormatError {
  return notText(`This is not a text file: it holds binary data (a NUL byte at byte ${at + 1}).`);
}

function notUtf8(base: number, bytes: Buffer): FileFormatError {
  // Where: the first byte at which fatal decoding of the prefix fails.
  let good = 0;
  let low = 0;
  let high = bytes.length;
  while (low < high) {
    const mid = (low + high + 1) >> 1;
    if (isUtf8(bytes.subarray(0, completeUtf8Length(bytes.subarray(0, mid))))) {
      good = mid;
      low = mid;
    } else high = mid - 1;
  }
  return notText(
    `The file is not UTF-8 text from byte ${base + completeUtf8Length(bytes.subarray(0, good)) + 1}: ` +
      'save it as UTF-8 ("CSV UTF-8" in most spreadsheets) and upload it again.',
  );
}
