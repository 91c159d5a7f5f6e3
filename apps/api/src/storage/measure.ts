import { createHash } from 'node:crypto';
import { Transform, type TransformCallback } from 'node:stream';
import { FileTooLargeError } from './storage.ts';

/** A pass-through stream that counts bytes, hashes them with SHA-256 and fails past `maxBytes`. */
export class MeasuringStream extends Transform {
  size = 0;
  private readonly hash = createHash('sha256');
  private digest: string | null = null;

  constructor(private readonly maxBytes: number) {
    super();
  }

  override _transform(chunk: Buffer, _encoding: BufferEncoding, callback: TransformCallback): void {
    this.size += chunk.length;
    if (this.size > this.maxBytes) return callback(new FileTooLargeError(this.maxBytes));
    this.hash.update(chunk);
    callback(null, chunk);
  }

  override _flush(callback: TransformCallback): void {
    this.digest = this.hash.digest('hex');
    callback();
  }

  get sha256(): string {
    if (this.digest === null) throw new Error('MeasuringStream: the stream has not finished');
    return this.digest;
  }
}
