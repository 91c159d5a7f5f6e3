import busboy from 'busboy';
import type { Request } from 'express';
import type { Readable } from 'node:stream';
import { AppError, badRequest } from '../errors/app-error.ts';

export type MultipartFile<T> = { filename: string; result: T; truncated: boolean };
export type MultipartBody<T> = { fields: Record<string, string>; file: MultipartFile<T> | null };

type FileOutcome<T> = { ok: true; file: MultipartFile<T> } | { ok: false; error: unknown };

/**
 * Reads a multipart/form-data request as a stream: text fields are collected, the one file field is
 * handed to `handleFile` as a stream (never buffered whole here). A file over `maxFileBytes` is cut at
 * the limit and reported as `truncated`; the caller decides what to do with what was written.
 *
 * Every failure — a body that ends inside a part, a malformed header, a second file, a client that
 * hangs up — becomes a 400 once `handleFile` has settled, and a handled file is then `discard`ed, so a
 * bad request never leaves anything behind and never throws outside the request.
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
      `Send the file as multipart/form-data with the file in the "${options.fileField}" field.`,
    );
  }
  const declared = Number(req.headers['content-length'] ?? NaN);
  // Multipart framing adds a little to the file; far beyond the limit we need not read the body at all.
  if (Number.isFinite(declared) && declared > options.maxFileBytes + 1024 * 1024) {
    req.resume();
    throw tooLarge(options.maxFileBytes);
  }

  let parser: busboy.Busboy;
  try {
    parser = busboy({
      headers: req.headers,
      // Two files are allowed through the parser so that a second one can be refused, not ignored.
      limits: { files: 2, fileSize: options.maxFileBytes, fields: 20, fieldSize: 256 * 1024, parts: 30 },
    });
  } catch (error) {
    req.resume();
    throw badRequest(`The multipart body cannot be read: ${(error as Error).message}.`);
  }

  const fields: Record<string, string> = {};
  let fileOutcome: Promise<FileOutcome<T>> | null = null;
  let refusal: AppError | null = null;
  const refuse = (error: AppError) => (refusal ??= error);

  const finished = new Promise<void>((resolve) => {
    parser.on('field', (name, value, info) => {
      if (info.valueTruncated) refuse(badRequest(`The form field "${name}" is too long.`));
      fields[name] = value;
    });
    parser.on('file', (name, stream, info) => {
      // A stream error must never go unobserved, even before (or without) a consumer.
      stream.on('error', () => {});
      if (name !== options.fileField || fileOutcome) {
        refuse(exactlyOneFile(options.fileField));
        stream.resume();
        return;
      }
      const filename = (info.filename ?? 'upload.csv').split(/[\\/]/).pop()!.slice(0, 255) || 'upload.csv';
      fileOutcome = options.handleFile(stream, filename).then(
        (result): FileOutcome<T> => ({
          ok: true,
          file: { filename, result, truncated: Boolean((stream as { truncated?: boolean }).truncated) },
        }),
        (error: unknown): FileOutcome<T> => {
          stream.resume(); // keep the parser going so the request is read to its end
          return { ok: false, error };
        },
      );
    });
    parser.on('filesLimit', () => refuse(exactlyOneFile(options.fileField)));
    parser.on('fieldsLimit', () => refuse(badRequest('The form has too many fields.')));
    parser.on('partsLimit', () => refuse(badRequest('The form has too many parts.')));
    parser.on('error', (error: Error) => {
      refuse(
        badRequest(
          `The upload was interrupted or is not valid multipart data (${error.message}). Send the whole file again.`,
        ),
      );
      resolve();
    });
    parser.on('close', () => resolve());
    // A client that hangs up mid-body: stop the parser, which fails the file stream, so the partial
    // file is deleted by whoever was writing it.
    req.on('close', () => {
      if (req.complete) return;
      parser.destroy(new Error('the connection closed before the body was complete'));
    });
    req.on('error', () => {});
  });
  req.pipe(parser);
  await finished;
  req.unpipe(parser);
  if (!req.complete) req.resume();

  const outcome = fileOutcome ? await (fileOutcome as Promise<FileOutcome<T>>) : null;
  if (refusal) {
    if (outcome?.ok && options.discard) await options.discard(outcome.file.result).catch(() => {});
    throw refusal;
  }
  if (outcome && !outcome.ok) throw outcome.error;
  return { fields, file: outcome?.ok ? outcome.file : null };
}

const exactlyOneFile = (field: string) =>
  badRequest(`Send exactly one file, in the "${field}" field (the form carried another file).`);

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
