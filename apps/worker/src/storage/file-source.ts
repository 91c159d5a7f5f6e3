import { DeleteObjectCommand, GetObjectCommand, S3Client } from '@aws-sdk/client-s3';
import { createReadStream } from 'node:fs';
import { rm, stat } from 'node:fs/promises';
import { join, resolve, sep } from 'node:path';
import { Readable } from 'node:stream';
import type { WorkerEnv } from '../config/env.ts';

/** Reads uploaded files back by their storage key (the API writes them; see apps/api/src/storage). */
export interface FileSource {
  open(key: string): Promise<Readable>;
  /** Removes a file once it is processed (patient files are not kept); a missing file is no error. */
  delete(key: string): Promise<void>;
}

export class LocalFileSource implements FileSource {
  private readonly root: string;
  constructor(root: string) {
    this.root = resolve(root);
  }
  async open(key: string): Promise<Readable> {
    const path = resolve(join(this.root, key));
    if (!path.startsWith(this.root + sep))
      throw new Error(`storage key outside the storage directory: ${key}`);
    await stat(path);
    return createReadStream(path, { highWaterMark: 256 * 1024 });
  }
  async delete(key: string): Promise<void> {
    const path = resolve(join(this.root, key));
    if (!path.startsWith(this.root + sep))
      throw new Error(`storage key outside the storage directory: ${key}`);
    await rm(path, { force: true });
  }
}

export class S3FileSource implements FileSource {
  private readonly client: S3Client;
  constructor(
    private readonly bucket: string,
    config: { region: string; endpoint?: string; accessKeyId?: string; secretAccessKey?: string },
  ) {
    this.client = new S3Client({
      region: config.region,
      endpoint: config.endpoint,
      forcePathStyle: Boolean(config.endpoint),
      credentials:
        config.accessKeyId && config.secretAccessKey
          ? { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey }
          : undefined,
    });
  }
  async open(key: string): Promise<Readable> {
    const result = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }));
    if (!(result.Body instanceof Readable)) throw new Error(`S3 object ${key} has no readable body`);
    return result.Body;
  }
  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }));
  }
}

/** S3 when S3_BUCKET is set, otherwise the local directory STORAGE_DIR (the same rule as the API). */
export function createFileSource(env: WorkerEnv): FileSource {
  if (env.S3_BUCKET) {
    return new S3FileSource(env.S3_BUCKET, {
      region: env.S3_REGION,
      endpoint: env.S3_ENDPOINT,
      accessKeyId: env.S3_ACCESS_KEY_ID,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY,
    });
  }
  return new LocalFileSource(env.STORAGE_DIR);
}
