import { normalizeHeader } from './csv-format.ts';

/**
 * Checks shared by every upload kind before a file is read as CSV: is it text at all, which header
 * names are repeated, which cells a spreadsheet would run as a formula, and control characters in
 * texts we store. Pure functions on bytes and strings, so the API's preview and the worker agree.
 */

/** How the bytes of a text file are decoded. */
export type TextEncoding = 'utf-8' | 'windows-1252';

/** Magic numbers of formats labs send by mistake, with the words used to name them. */
const SIGNATURES: readonly { bytes: readonly number[]; what: string }[] = [
  { bytes: [0x1f, 0x8b], what: 'a gzip archive' },
  {
    bytes: [0x50, 0x4b, 0x03, 0x04],
    what: 'a zip archive (an .xlsx workbook is one: save the sheet as CSV)',
  },
  { bytes: [0x50, 0x4b, 0x05, 0x06], what: 'an empty zip archive' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old-style Excel (.xls) workbook: save the sheet as CSV' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document' },
  { bytes: [0x42, 0x5a, 0x68], what: 'a bzip2 archive' },
  { bytes: [0x37, 0x7a, 0xbc, 0xaf, 0x27, 0x1c], what: 'a 7-Zip archive' },
  { bytes: [0xfd, 0x37, 0x7a, 0x58, 0x5a, 0x00], what: 'an xz archive' },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
];

const startsWith = (head: Uint8Array, bytes: readonly number[]) =>
  head.length >= bytes.length && bytes.every((b, i) => head[i] === b);

/**
 * Windows-1252 leaves five bytes undefined (0x81, 0x8D, 0x8F, 0x90, 0x9D; WHATWG Encoding Standard,
 * index-windows-1252); C0 control bytes other than tab, line feed and carriage return do not occur in
 * a text file. A head that is not UTF-8 but avoids all of these is read as Windows-1252, the encoding
 * spreadsheets on Windows write "CSV" in (common practice).
 */
function looksLikeWindows1252(head: Uint8Array): boolean {
  for (const b of head) {
    if (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d) return false;
    if (b === 0x81 || b === 0x8d || b === 0x8f || b === 0x90 || b === 0x9d) return false;
  }
  return true;
}

/**
 * Decides from the first bytes of a file (the first 64 KB is plenty) whether it is text, and how to
 * decode it. UTF-16 is refused, with or without a byte-order mark: labs are asked for UTF-8, and a
 * UTF-16 file read as UTF-8 would be all NUL bytes.
 */
export function sniffTextFile(
  head: Uint8Array,
  isComplete: boolean,
): { encoding: TextEncoding } | { problem: string } {
  const notText = (what: string) => ({ problem: `This is not a text file: it looks like ${what}.` });
  if (
    head.length >= 2 &&
    ((head[0] === 0xff && head[1] === 0xfe) || (head[0] === 0xfe && head[1] === 0xff))
  ) {
    return {
      problem:
        'The file is saved as UTF-16 text. Save it as UTF-8 ("CSV UTF-8" in most spreadsheets) and upload it again.',
    };
  }
  for (const signature of SIGNATURES) if (startsWith(head, signature.bytes)) return notText(signature.what);
  const nul = head.indexOf(0);
  if (nul !== -1) {
    // Text saved as UTF-16 without a byte-order mark has a NUL beside nearly every ASCII character.
    const zeros = head.reduce((count, b) => count + (b === 0 ? 1 : 0), 0);
    if (zeros * 3 >= head.length) {
      return {
        problem:
          'This is not a UTF-8 text file: it looks like UTF-16 text without a byte-order mark. Save it as UTF-8 and upload it again.',
      };
    }
    return notText(`binary data (a NUL byte at byte ${nul + 1})`);
  }
  // The head may end inside a multi-byte character: leave out up to 3 trailing bytes when checking.
  const checked = isComplete ? head : head.subarray(0, completeUtf8Length(head));
  if (isUtf8(checked)) return { encoding: 'utf-8' };
  if (looksLikeWindows1252(head)) return { encoding: 'windows-1252' };
  return notText('binary data: it is neither UTF-8 nor Windows-1252 (Latin-1) text');
}

/** Whether the bytes are valid UTF-8 (WHATWG decoder, fatal mode). */
export function isUtf8(bytes: Uint8Array): boolean {
  try {
    new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return true;
  } catch {
    return false;
  }
}

/** The length of the bytes without a multi-byte UTF-8 character cut off at the end. */
export function completeUtf8Length(bytes: Uint8Array): number {
  const end = bytes.length;
  for (let back = 1; back <= Math.min(3, end); back++) {
    const b = bytes[end - back];
    if ((b & 0xc0) === 0x80) continue; // a continuation byte: look further back
    const needed = b >= 0xf0 ? 4 : b >= 0xe0 ? 3 : b >= 0xc0 ? 2 : 1;
    return needed > back ? end - back : end;
  }
  return end;
}

/**
 * Removes C0 and C1 control characters and DEL (NUL included) from a text we store, such as an error
 * message that quotes a cell: PostgreSQL refuses NUL in text and JSON, and the others garble screens
 * and logs. Line breaks and tabs become spaces.
 */
export function stripControlCharacters(text: string): string {
  // eslint-disable-next-line no-control-regex
  return text.replace(/[\t\n\r]/g, ' ').replace(/[\u0000-\u001f\u007f-\u009f]/g, '');
}

/** The first header repeated in the file (names compared as the column mapping compares them), or null. */
export function duplicateHeader(headers: readonly string[]): string | null {
  const seen = new Set<string>();
  for (const header of headers) {
    const key = normalizeHeader(header);
    if (key === '') continue;
    if (seen.has(key)) return header;
    seen.add(key);
  }
  return null;
}

/**
 * Whether a text cell would run as a formula when the data is opened in a spreadsheet: it starts with
 * =, +, -, @, a tab or a carriage return (OWASP, "CSV Injection").
 */
export function isFormulaLike(text: string): boolean {
  return /^[=+\-@\t\r]/.test(text);
}
