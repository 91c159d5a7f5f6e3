import type { Readable } from 'node:stream';

/** What was written: the key to read it back by, its size and its SHA-256 (hex). */
export type StoredObject = { key: string; size: number; sha256: string };

/**
 * Where uploaded files live. Writes are streamed: the file is never held whole in memory, and its size
 * and SHA-256 are computed on the way through. A write over `maxBytes` fails with FileTooLargeError and
 * leaves nothing behind.
 */
export interface FileStorage {
  readonly kind: 'local' | 's3';
  write(key: string, body: Readable, options: { maxBytes: number }): Promise<StoredObject>;
  read(key: string): Promise<Readable>;
  delete(key: string): Promise<void>;
  /**
   * Removes what interrupted writes left behind (a process killed mid-write) that is older than
   * `olderThanMs`; returns how many were removed. A store that leaves nothing behind has none.
   */
  sweepAbandoned?(olderThanMs: number): Promise<number>;
}

export class FileTooLargeError extends Error {
  constructor(readonly maxBytes: number) {
    super(`The file is larger than the limit of ${maxBytes} bytes.`);
    this.name = 'FileTooLargeError';
  }
}

/** A storage key for a new upload: spread over year/month folders, named by the upload id. */
export function uploadStorageKey(uploadId: string, now = new Date()): string {
  const month = String(now.getUTCMonth() + 1).padStart(2, '0');
  return `uploads/${now.getUTCFullYear()}/${month}/${uploadId}`;
}
