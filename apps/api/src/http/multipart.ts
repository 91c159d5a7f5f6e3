import busboy from 'busboy';
import type { Request } from 'express';
import type { Readable } from 'node:stream';
import { AppError, badRequest } from '../errors/app-error.ts';

export type MultipartFile<T> = { filename: string; result: T; truncated: boolean };
export type MultipartBody<T> = { fields: Record<string, string>; file: MultipartFile<T> | null };

/**
 * Reads a multipart/form-data request as a stream: text fields are collected, the one file field is
 * handed to `handleFile` as a stream (never buffered whole here). A file over `maxFileBytes` is cut at
 * the limit and reported as `truncated`; the caller decides what to do with what was written.
 * Errors from `handleFile` are rethrown once the request has been read to its end.
 */
export async function readMultipart<T>(
  req: Request,
  options: {
    fileField: string;
    maxFileBytes: number;
    handleFile: (stream: Readable, filename: string) => Promise<T>;
    /** Called for a handled file when reading the request failed afterwards, so nothing is left behind. */
    discard?: (result: T) => Promise<void>;
  },
): Promise<MultipartBody<T>> {
  const contentType = req.headers['content-type'] ?? '';
  if (!/^multipart\/form-data/i.test(contentType)) {
    throw new AppError(
      'unsupported_media_type',
      'Send the file as multipart/form-data with the file in the "file" field.',
    );
  }
  const declared = Number(req.headers['content-length'] ?? NaN);
  // Multipart framing adds a little to the file; far beyond the limit we need not read the body at all.
  if (Number.isFinite(declared) && declared > options.maxFileBytes + 1024 * 1024) {
    req.resume();
    throw tooLarge(options.maxFileBytes);
  }

  return new Promise<MultipartBody<T>>((resolve, reject) => {
    const fields: Record<string, string> = {};
    let filePromise: Promise<MultipartFile<T>> | null = null;
    let extraFile = false;
    let parser: busboy.Busboy;
    try {
      parser = busboy({
        headers: req.headers,
        limits: { files: 1, fileSize: options.maxFileBytes, fields: 20, fieldSize: 256 * 1024, parts: 30 },
      });
    } catch (error) {
      reject(badRequest(`The multipart body cannot be read: ${(error as Error).message}`));
      return;
    }

    parser.on('field', (name, value) => {
      fields[name] = value;
    });
    parser.on('file', (name, stream, info) => {
      if (name !== options.fileField || filePromise) {
        extraFile = true;
        stream.resume();
        return;
      }
      const filename = (info.filename ?? 'upload.csv').split(/[\\/]/).pop()!.slice(0, 255) || 'upload.csv';
      filePromise = options.handleFile(stream, filename).then(
        (result) => ({ filename, result, truncated: Boolean((stream as { truncated?: boolean }).truncated) }),
        (error: unknown) => {
          stream.resume(); // keep the parser going so the request is read to its end
          throw error;
        },
      );
      // Handled when awaited below; this only stops an early failure from being reported as unhandled.
      filePromise.catch(() => {});
    });
    parser.on('error', async (error: Error) => {
      if (filePromise && options.discard) {
        await filePromise.then((f) => options.discard!(f.result)).catch(() => {});
      }
      reject(badRequest(`The upload was interrupted or is not valid multipart data: ${error.message}`));
    });
    parser.on('close', () => {
      if (extraFile) {
        const cleanup =
          filePromise && options.discard ? filePromise.then((f) => options.discard!(f.result)) : null;
        Promise.resolve(cleanup)
          .catch(() => {})
          .then(() => reject(badRequest(`Send exactly one file, in the "${options.fileField}" field.`)));
        return;
      }
      if (!filePromise) return resolve({ fields, file: null });
      filePromise.then((file) => resolve({ fields, file }), reject);
    });
    req.pipe(parser);
  });
}

export const tooLarge = (maxBytes: number) =>
  new AppError(
    'payload_too_large',
    `The file is larger than the limit of ${formatBytes(maxBytes)}. Split it (for example by month) and upload the parts.`,
    { maxBytes },
  );

function formatBytes(bytes: number): string {
  if (bytes >= 1024 * 1024) return `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;
  if (bytes >= 1024) return `${Math.round((bytes / 1024) * 10) / 10} KB`;
  return `${bytes} bytes`;
}
