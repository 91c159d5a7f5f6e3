import {
  AbortMultipartUploadCommand,
  CompleteMultipartUploadCommand,
  CreateMultipartUploadCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  PutObjectCommand,
  S3Client,
  UploadPartCommand,
  type CompletedPart,
} from '@aws-sdk/client-s3';
import { Readable } from 'node:stream';
import { MeasuringStream } from './measure.ts';
import type { FileStorage, StoredObject } from './storage.ts';

export type S3StorageConfig = {
  bucket: string;
  region: string;
  /** Set for any S3-compatible store other than AWS itself; path-style addressing is then used. */
  endpoint?: string;
  accessKeyId?: string;
  secretAccessKey?: string;
};

/** Parts of a multipart upload: S3 needs at least 5 MiB for every part but the last. */
const PART_SIZE = 8 * 1024 * 1024;

export function createS3Client(config: S3StorageConfig): S3Client {
  return new S3Client({
    region: config.region,
    endpoint: config.endpoint,
    forcePathStyle: Boolean(config.endpoint),
    credentials:
      config.accessKeyId && config.secretAccessKey
        ? { accessKeyId: config.accessKeyId, secretAccessKey: config.secretAccessKey }
        : undefined,
  });
}

/**
 * Files in an S3-compatible bucket. A file is sent as a multipart upload part by part, so at most one
 * part (8 MiB) is in memory; a file smaller than one part is sent with a single PUT.
 */
export class S3FileStorage implements FileStorage {
  readonly kind = 's3' as const;
  private readonly client: S3Client;

  constructor(
    private readonly config: S3StorageConfig,
    client?: S3Client,
  ) {
    this.client = client ?? createS3Client(config);
  }

  async write(key: string, body: Readable, options: { maxBytes: number }): Promise<StoredObject> {
    const measure = new MeasuringStream(options.maxBytes);
    body.on('error', (error) => measure.destroy(error));
    body.pipe(measure);

    const Bucket = this.config.bucket;
    let uploadId: string | undefined;
    const parts: CompletedPart[] = [];
    let pending: Buffer[] = [];
    let pendingBytes = 0;

    const sendPart = async () => {
      if (!uploadId) {
        const created = await this.client.send(new CreateMultipartUploadCommand({ Bucket, Key: key }));
        uploadId = created.UploadId;
      }
      const PartNumber = parts.length + 1;
      const result = await this.client.send(
        new UploadPartCommand({
          Bucket,
          Key: key,
          UploadId: uploadId,
          PartNumber,
          Body: Buffer.concat(pending),
        }),
      );
      parts.push({ ETag: result.ETag, PartNumber });
      pending = [];
      pendingBytes = 0;
    };

    try {
      for await (const chunk of measure) {
        pending.push(chunk as Buffer);
        pendingBytes += (chunk as Buffer).length;
        if (pendingBytes >= PART_SIZE) await sendPart();
      }
      if (!uploadId) {
        await this.client.send(new PutObjectCommand({ Bucket, Key: key, Body: Buffer.concat(pending) }));
      } else {
        if (pendingBytes > 0) await sendPart();
        await this.client.send(
          new CompleteMultipartUploadCommand({
            Bucket,
            Key: key,
            UploadId: uploadId,
            MultipartUpload: { Parts: parts },
          }),
        );
      }
    } catch (error) {
      if (uploadId) {
        await this.client
          .send(new AbortMultipartUploadCommand({ Bucket, Key: key, UploadId: uploadId }))
          .catch(() => {});
      }
      throw error;
    }
    return { key, size: measure.size, sha256: measure.sha256 };
  }

  async read(key: string): Promise<Readable> {
    const result = await this.client.send(new GetObjectCommand({ Bucket: this.config.bucket, Key: key }));
    if (!(result.Body instanceof Readable)) throw new Error(`S3 object ${key} has no readable body`);
    return result.Body;
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.config.bucket, Key: key }));
  }
}
