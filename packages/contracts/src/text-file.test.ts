import { describe, expect, it } from 'vitest';
import { gzipSync } from 'node:zlib';
import {
  completeUtf8Length,
  duplicateHeader,
  isFormulaLike,
  sniffTextFile,
  stripControlCharacters,
} from './text-file.ts';

const bytes = (text: string) => new TextEncoder().encode(text);

describe('sniffTextFile', () => {
  it('when the bytes are UTF-8 text, then they are read as UTF-8', () => {
    expect(sniffTextFile(bytes('period,mean\n2026-02,5.5\nµmol/L,Ä\n'), true)).toEqual({ encoding: 'utf-8' });
  });

  it('when the head ends inside a multi-byte character, then the file is still UTF-8', () => {
    // "é" is C3 A9 in UTF-8 (RFC 3629); cut after C3.
    const head = bytes('name,é').subarray(0, 6);
    expect(sniffTextFile(head, false)).toEqual({ encoding: 'utf-8' });
    // As a whole file, a lone C3 is not UTF-8; it is "Ã" in Windows-1252.
    expect(sniffTextFile(head, true)).toEqual({ encoding: 'windows-1252' });
  });

  it('when the text is Windows-1252 (Ä as the single byte C4), then it is read as Windows-1252', () => {
    // C4 is "Ä" in Windows-1252 (WHATWG index-windows-1252) and not valid UTF-8 on its own.
    const head = Uint8Array.from([...bytes('comment\nM'), 0xc4, ...bytes('rz\n')]);
    expect(sniffTextFile(head, true)).toEqual({ encoding: 'windows-1252' });
  });

  it('when the file is a gzip or zip archive, then it is named as such', () => {
    // Magic numbers: gzip 1F 8B (RFC 1952), zip local file header 50 4B 03 04 (PKWARE APPNOTE).
    expect(sniffTextFile(gzipSync(Buffer.from('a,b\n')), true)).toEqual({
      problem: 'This is not a text file: it looks like a gzip archive.',
    });
    const zip = sniffTextFile(Uint8Array.from([0x50, 0x4b, 0x03, 0x04, 0x14, 0x00]), true);
    expect('problem' in zip && zip.problem).toMatch(/zip archive/);
  });

  it('when the file holds NUL bytes or UTF-16, then it is refused with the reason', () => {
    const nul = sniffTextFile(Uint8Array.from([0x61, 0x2c, 0x00, 0x62]), true);
    expect('problem' in nul && nul.problem).toMatch(/NUL byte at byte 3/);
    const utf16le = sniffTextFile(Uint8Array.from(Buffer.from('\ufeffa,b\n', 'utf16le')), true);
    expect('problem' in utf16le && utf16le.problem).toMatch(/UTF-16/);
    const noBom = sniffTextFile(Uint8Array.from(Buffer.from('period,mean\n', 'utf16le')), true);
    expect('problem' in noBom && noBom.problem).toMatch(/UTF-16 text without a byte-order mark/);
  });

  it('when bytes are neither UTF-8 nor Windows-1252, then the file is refused', () => {
    // 81 is undefined in Windows-1252; 01 is a control byte no text file holds.
    const result = sniffTextFile(Uint8Array.from([0x61, 0x81, 0x01, 0x62]), true);
    expect('problem' in result && result.problem).toMatch(/neither UTF-8 nor Windows-1252/);
  });
});

describe('completeUtf8Length', () => {
  it('when a 3-byte character (€, E2 82 AC per RFC 3629) is cut, then its start is left out', () => {
    const euro = bytes('a€');
    expect(completeUtf8Length(euro)).toBe(4);
    expect(completeUtf8Length(euro.subarray(0, 3))).toBe(1);
    expect(completeUtf8Length(euro.subarray(0, 2))).toBe(1);
  });
});

describe('stripControlCharacters', () => {
  it('when a text holds NUL, bell, DEL and C1 characters, then they are removed and line breaks become spaces', () => {
    expect(stripControlCharacters('a\u0000b\u0007c\u007fd\u0085e\r\nf\tg')).toBe('abcde  f g');
  });
});

describe('duplicateHeader', () => {
  it('when a header repeats a name (also in another case or spelling), then the repeat is returned', () => {
    expect(duplicateHeader(['period', 'mean', 'sd', 'mean'])).toBe('mean');
    expect(duplicateHeader(['period', 'SD', 'sd'])).toBe('sd');
    expect(duplicateHeader(['period', '', '', 'mean'])).toBeNull();
  });
});

describe('isFormulaLike', () => {
  it('when a cell starts with =, +, -, @, tab or CR (OWASP CSV Injection), then it is formula-like', () => {
    for (const text of ['=1+1', '+A1', '-2', '@SUM(A1)', '\tx', '\rx'])
      expect(isFormulaLike(text), text).toBe(true);
    for (const text of ['GLU1', 'a=b', '']) expect(isFormulaLike(text), text).toBe(false);
  });
});
