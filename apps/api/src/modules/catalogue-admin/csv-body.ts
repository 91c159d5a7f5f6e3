import type { Request } from 'express';
import busboy from 'busboy';
import { AppError } from '../../errors/app-error.ts';

/** Catalogue lists are small; a few megabytes is far more than any of them needs. */
export const MAX_CATALOGUE_CSV_BYTES = 5 * 1024 * 1024;

const CSV_TYPES = ['text/csv', 'text/plain', 'application/csv', 'application/vnd.ms-excel'];

const tooLarge = () =>
  new AppError(
    'payload_too_large',
    `The CSV file is larger than ${MAX_CATALOGUE_CSV_BYTES / 1024 / 1024} MB.`,
  );

function readRaw(req: Request): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (chunk: Buffer) => {
      size += chunk.length;
      if (size > MAX_CATALOGUE_CSV_BYTES) {
        req.removeAllListeners('data');
        req.resume();
        reject(tooLarge());
        return;
      }
      chunks.push(chunk);
    });
    req.on('end', () => resolve(Buffer.concat(chunks)));
    req.on('error', reject);
  });
}

function readMultipartFile(req: Request): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    let parser: busboy.Busboy;
    try {
      parser = busboy({ headers: req.headers, limits: { files: 1, fileSize: MAX_CATALOGUE_CSV_BYTES } });
    } catch {
      reject(new AppError('bad_request', 'The multipart body could not be read.'));
      return;
    }
    let file: Buffer | null = null;
    let failure: AppError | null = null;
    parser.on('file', (field, stream) => {
      if (field !== 'file') {
        stream.resume();
        return;
      }
      const chunks: Buffer[] = [];
      stream.on('data', (chunk: Buffer) => chunks.push(chunk));
      stream.on('limit', () => (failure = tooLarge()));
      stream.on('end', () => (file = Buffer.concat(chunks)));
    });
    parser.on('error', () => reject(new AppError('bad_request', 'The multipart body could not be read.')));
    parser.on('close', () => {
      if (failure) reject(failure);
      else if (!file)
        reject(new AppError('bad_request', 'Attach the CSV file in a form field named "file".'));
      else resolve(file);
    });
    req.pipe(parser);
  });
}

/** The CSV text of an import request: a text/csv body or a multipart form with a `file` field. */
export async function readCsvBody(req: Request): Promise<string> {
  const type = (req.headers['content-type'] ?? '').split(';')[0].trim().toLowerCase();
  let bytes: Buffer;
  if (type === 'multipart/form-data') bytes = await readMultipartFile(req);
  else if (CSV_TYPES.includes(type)) bytes = await readRaw(req);
  else {
    throw new AppError(
      'unsupported_media_type',
      `Send the CSV as text/csv or as multipart/form-data with a "file" field (received ${type || 'no content type'}).`,
    );
  }
  const text = bytes.toString('utf8');
  if (text.includes('\uFFFD')) throw new AppError('bad_request', 'The CSV file is not valid UTF-8 text.');
  return text;
}
