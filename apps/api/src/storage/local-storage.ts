import { createReadStream, createWriteStream } from 'node:fs';
import { mkdir, readdir, rename, rm, stat } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
import { randomBytes } from 'node:crypto';
import type { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { MeasuringStream } from './measure.ts';
import type { FileStorage, StoredObject } from './storage.ts';

/** Files under a directory on the local disk (the default). Writes go to a temporary name, then are renamed. */
export class LocalFileStorage implements FileStorage {
  readonly kind = 'local' as const;
  private readonly root: string;

  constructor(root: string) {
    this.root = resolve(root);
  }

  private pathOf(key: string): string {
    const path = resolve(join(this.root, key));
    // Keys are made by the service, but a key must never reach outside the storage directory.
    if (!path.startsWith(this.root + sep))
      throw new Error(`storage key outside the storage directory: ${key}`);
    return path;
  }

  async write(key: string, body: Readable, options: { maxBytes: number }): Promise<StoredObject> {
    const path = this.pathOf(key);
    await mkdir(dirname(path), { recursive: true });
    const temporary = `${path}.${randomBytes(4).toString('hex')}.partial`;
    const measure = new MeasuringStream(options.maxBytes);
    try {
      await pipeline(body, measure, createWriteStream(temporary));
      await rename(temporary, path);
    } catch (error) {
      await rm(temporary, { force: true });
      throw error;
    }
    return { key, size: measure.size, sha256: measure.sha256 };
  }

  async read(key: string): Promise<Readable> {
    const path = this.pathOf(key);
    await stat(path); // a missing file fails here, before anyone starts reading
    return createReadStream(path);
  }

  async delete(key: string): Promise<void> {
    await rm(this.pathOf(key), { force: true });
  }

  /** Deletes `.partial` files (writes that never finished: the process died) older than `olderThanMs`. */
  async sweepAbandoned(olderThanMs: number): Promise<number> {
    let removed = 0;
    const entries = await readdir(this.root, { recursive: true, withFileTypes: true }).catch(() => []);
    for (const entry of entries) {
      if (!entry.isFile() || !entry.name.endsWith('.partial')) continue;
      const path = join(entry.parentPath, entry.name);
      const info = await stat(path).catch(() => null);
      if (info && Date.now() - info.mtimeMs > olderThanMs) {
        await rm(path, { force: true });
        removed += 1;
      }
    }
    return removed;
  }
}
