import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createHash, randomBytes } from 'node:crypto';
import { mkdirSync, mkdtempSync, readdirSync, rmSync, utimesSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Readable } from 'node:stream';
import { text } from 'node:stream/consumers';
import { FileTooLargeError, LocalFileStorage, S3FileStorage, type FileStorage } from './index.ts';
import { startFakeS3, type FakeS3 } from './fake-s3.ts';

const dirs: string[] = [];
afterAll(() => dirs.forEach((d) => rmSync(d, { recursive: true, force: true })));

/** A stream of `total` bytes in 64 KiB chunks, generated as it is read (never held whole). */
function generated(total: number, seed = 7): { stream: Readable; sha256: string } {
  const hash = createHash('sha256');
  const chunks: Buffer[] = [];
  for (let sent = 0; sent < total; sent += 65536) {
    const chunk = Buffer.alloc(Math.min(65536, total - sent), (sent / 65536 + seed) % 251);
    hash.update(chunk);
    chunks.push(chunk);
  }
  return { stream: Readable.from(chunks), sha256: hash.digest('hex') };
}

function behavesLikeStorage(name: string, make: () => FileStorage) {
  describe(name, () => {
    it('when a file is written, then size and SHA-256 (node:crypto) match and it reads back', async () => {
      const storage = make();
      const key = `uploads/test/${randomBytes(4).toString('hex')}`;
      const input = generated(300_000);
      const stored = await storage.write(key, input.stream, { maxBytes: 1_000_000 });
      expect(stored).toEqual({ key, size: 300_000, sha256: input.sha256 });
      const back = createHash('sha256');
      for await (const chunk of await storage.read(key)) back.update(chunk as Buffer);
      expect(back.digest('hex')).toBe(input.sha256);
      await storage.delete(key);
      await expect(storage.read(key)).rejects.toThrow();
    });

    it('when a file is over the limit, then the write fails and leaves nothing', async () => {
      const storage = make();
      const key = `uploads/test/${randomBytes(4).toString('hex')}`;
      await expect(
        storage.write(key, generated(200_000).stream, { maxBytes: 100_000 }),
      ).rejects.toBeInstanceOf(FileTooLargeError);
      await expect(storage.read(key)).rejects.toThrow();
    });
  });
}

const localDir = mkdtempSync(join(tmpdir(), 'plumbline-storage-'));
dirs.push(localDir);
behavesLikeStorage('local file storage', () => new LocalFileStorage(localDir));

describe('local file storage', () => {
  it('when a write fails, then no partial file is left in the directory', async () => {
    const storage = new LocalFileStorage(localDir);
    await storage.write('uploads/a/b', Readable.from([Buffer.from('x')]), { maxBytes: 10 }).catch(() => {});
    await storage.write('uploads/a/c', generated(50).stream, { maxBytes: 10 }).catch(() => {});
    expect(readdirSync(join(localDir, 'uploads/a'))).toEqual(['b']);
    expect(await text(await storage.read('uploads/a/b'))).toBe('x');
  });

  it('when a key would leave the storage directory, then it is refused', async () => {
    const storage = new LocalFileStorage(localDir);
    await expect(
      storage.write('../escape', Readable.from([Buffer.from('x')]), { maxBytes: 10 }),
    ).rejects.toThrow(/outside/);
  });
});

// The S3 adapter is checked against fake-s3.ts, an in-memory server speaking the few S3 REST calls the
// adapter makes (no S3 fake package is installed in this workspace). Set PLUMBLINE_TEST_S3_ENDPOINT
// and PLUMBLINE_TEST_S3_BUCKET to run the same checks against a real S3-compatible store instead.
let fake: FakeS3 | null = null;
const s3Bucket = process.env.PLUMBLINE_TEST_S3_BUCKET ?? 'plumbline-test';
beforeAll(async () => {
  if (!process.env.PLUMBLINE_TEST_S3_ENDPOINT) fake = await startFakeS3(s3Bucket);
});
afterAll(async () => fake?.close());
const s3 = () =>
  new S3FileStorage({
    bucket: s3Bucket,
    region: 'us-east-1',
    endpoint: process.env.PLUMBLINE_TEST_S3_ENDPOINT ?? fake!.endpoint,
    accessKeyId: process.env.PLUMBLINE_TEST_S3_ACCESS_KEY_ID ?? 'test-key',
    secretAccessKey: process.env.PLUMBLINE_TEST_S3_SECRET_ACCESS_KEY ?? 'test-secret',
  });
behavesLikeStorage('S3 storage', s3);

describe('S3 storage, large files', () => {
  it('when a file is larger than one part, then it goes up as a multipart upload and reads back whole', async () => {
    const storage = s3();
    const key = `uploads/test/${randomBytes(4).toString('hex')}`;
    const input = generated(20 * 1024 * 1024 + 123);
    const stored = await storage.write(key, input.stream, { maxBytes: 100 * 1024 * 1024 });
    expect(stored).toEqual({ key, size: 20 * 1024 * 1024 + 123, sha256: input.sha256 });
    const back = createHash('sha256');
    for await (const chunk of await storage.read(key)) back.update(chunk as Buffer);
    expect(back.digest('hex')).toBe(input.sha256);
    if (fake) {
      expect(fake.requests.filter((r) => r === 'UploadPart')).toHaveLength(3);
      expect(fake.requests).toContain('CompleteMultipartUpload');
    }
  });

  it('when a multipart file goes over the limit, then the upload is aborted and nothing is left', async () => {
    const storage = s3();
    const key = `uploads/test/${randomBytes(4).toString('hex')}`;
    await expect(
      storage.write(key, generated(20 * 1024 * 1024).stream, { maxBytes: 10 * 1024 * 1024 }),
    ).rejects.toBeInstanceOf(FileTooLargeError);
    await expect(storage.read(key)).rejects.toThrow();
    if (fake) expect(fake.requests).toContain('AbortMultipartUpload');
  });
});

describe('sweeping partial files of interrupted writes', () => {
  it('when the directory holds an old partial file, a fresh one and a stored file, then only the old partial is removed', async () => {
    const root = mkdtempSync(join(tmpdir(), 'plumbline-sweep-'));
    dirs.push(root);
    const storage = new LocalFileStorage(root);
    await storage.write('uploads/2026/02/kept', Readable.from([Buffer.from('a,b\n')]), { maxBytes: 100 });
    mkdirSync(join(root, 'uploads/2026/02'), { recursive: true });
    const stale = join(root, 'uploads/2026/02/abandoned.1234abcd.partial');
    const fresh = join(root, 'uploads/2026/02/writing.5678abcd.partial');
    writeFileSync(stale, 'period,');
    writeFileSync(fresh, 'period,');
    const twoHoursAgo = new Date(Date.now() - 2 * 3600_000);
    utimesSync(stale, twoHoursAgo, twoHoursAgo);

    expect(await storage.sweepAbandoned(3600_000)).toBe(1);
    expect(readdirSync(join(root, 'uploads/2026/02')).sort()).toEqual(['kept', 'writing.5678abcd.partial']);
  });
});
