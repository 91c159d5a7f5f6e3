import type { Request } from 'express';
import { AppError } from '../../errors/app-error.ts';
import { readMultipart } from '../../http/multipart.ts';

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

async function readMultipartFile(req: Request): Promise<Buffer> {
  const body = await readMultipart<Buffer>(req, {
    fileField: 'file',
    maxFileBytes: MAX_CATALOGUE_CSV_BYTES,
    handleFile: async (stream) => {
      const chunks: Buffer[] = [];
      for await (const chunk of stream) chunks.push(chunk as Buffer);
      return Buffer.concat(chunks);
    },
  });
  if (!body.file) throw new AppError('bad_request', 'Attach the CSV file in a form field named "file".');
  if (body.file.truncated) throw tooLarge();
  return body.file.result;
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
