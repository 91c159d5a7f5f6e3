import type { Env } from '../config/env.ts';
import { LocalFileStorage } from './local-storage.ts';
import { S3FileStorage } from './s3-storage.ts';
import type { FileStorage } from './storage.ts';

export * from './storage.ts';
export { LocalFileStorage } from './local-storage.ts';
export { S3FileStorage } from './s3-storage.ts';

/** S3 when S3_BUCKET is set, otherwise the local directory STORAGE_DIR. */
export function createFileStorage(env: Env): FileStorage {
  if (env.S3_BUCKET) {
    return new S3FileStorage({
      bucket: env.S3_BUCKET,
      region: env.S3_REGION,
      endpoint: env.S3_ENDPOINT,
      accessKeyId: env.S3_ACCESS_KEY_ID,
      secretAccessKey: env.S3_SECRET_ACCESS_KEY,
    });
  }
  return new LocalFileStorage(env.STORAGE_DIR);
}
