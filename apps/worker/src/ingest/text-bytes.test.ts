import { describe, expect, it } from 'vitest';
import { Readable } from 'node:stream';
import { openCsv } from './csv-reader.ts';
import { FileFormatError } from './file-format-error.ts';
import { textBytes } from './text-bytes.ts';

async function collect(chunks: Buffer[], encoding: 'utf-8' | 'windows-1252') {
  const out: Buffer[] = [];
  for await (const chunk of textBytes(Readable.from(chunks), encoding)) out.push(chunk);
  return Buffer.concat(out).toString('utf8');
}

describe('textBytes', () => {
  it('when a multi-byte character is split between chunks, then the bytes pass unchanged', async () => {
    // "µ" is C2 B5 in UTF-8 (RFC 3629).
    const text = 'unit\nµmol/L\n';
    const all = Buffer.from(text);
    const at = all.indexOf(0xc2) + 1;
    expect(await collect([all.subarray(0, at), all.subarray(at)], 'utf-8')).toBe(text);
  });

  it('when a byte far into the file is not UTF-8, then the file is refused naming the byte', async () => {
    const head = Buffer.from('a,b\n'.repeat(10));
    const error = await collect([head, Buffer.from([0x31, 0xff, 0x0a])], 'utf-8').catch((e) => e);
    expect(error).toBeInstanceOf(FileFormatError);
    expect(error.message).toMatch(`not UTF-8 text from byte ${head.length + 2}`);
  });

  it('when a NUL byte comes late in the file, then the file is refused as binary', async () => {
    const error = await collect([Buffer.from('a,b\n'), Buffer.from([0x31, 0x00])], 'utf-8').catch((e) => e);
    expect(error.message).toMatch(/NUL byte at byte 6/);
  });

  it('when the file is Windows-1252, then it is passed on as UTF-8 (C4 is Ä, B5 is µ: WHATWG index-windows-1252)', async () => {
    const bytes = Buffer.from([0x4d, 0xc4, 0x2c, 0xb5, 0x0a]);
    expect(await collect([bytes], 'windows-1252')).toBe('MÄ,µ\n');
  });
});

describe('openCsv on a Windows-1252 file', () => {
  it('when a cell holds a Windows-1252 character, then the record carries it decoded', async () => {
    const file = Buffer.concat([
      Buffer.from('unit,comment\nmmol/L,M'),
      Buffer.from([0xe4]),
      Buffer.from('rz\n'),
    ]);
    const csv = await openCsv(Readable.from([file]), undefined, async () => Readable.from([file]));
    const records = [];
    for await (const r of csv.records) records.push(r.cells);
    // E4 is "ä" in Windows-1252.
    expect(records).toEqual([
      ['unit', 'comment'],
      ['mmol/L', 'März'],
    ]);
  });
});
