import { createServer, type IncomingMessage, type Server } from 'node:http';
import { createHash, randomUUID } from 'node:crypto';
import type { AddressInfo } from 'node:net';

/**
 * Test support: a small in-memory server speaking the part of the S3 REST protocol the storage adapter
 * uses (path-style PutObject, GetObject, DeleteObject and multipart uploads). It checks no signatures.
 * It stands in for an S3-compatible store in tests; it is not a general S3 emulator.
 */
export type FakeS3 = {
  endpoint: string;
  objects: Map<string, Buffer>;
  requests: string[];
  close: () => Promise<void>;
};

export async function startFakeS3(bucket: string): Promise<FakeS3> {
  const objects = new Map<string, Buffer>();
  const uploads = new Map<string, { key: string; parts: Map<number, Buffer> }>();
  const requests: string[] = [];

  const server: Server = createServer(async (req, res) => {
    try {
      const url = new URL(req.url ?? '/', 'http://fake-s3');
      const [, bucketName, ...rest] = decodeURIComponent(url.pathname).split('/');
      const key = rest.join('/');
      const query = url.searchParams;
      const body = await readBody(req);
      const operation =
        req.method === 'POST' && query.has('uploads')
          ? 'CreateMultipartUpload'
          : req.method === 'PUT' && query.has('partNumber')
            ? 'UploadPart'
            : req.method === 'POST' && query.has('uploadId')
              ? 'CompleteMultipartUpload'
              : req.method === 'DELETE' && query.has('uploadId')
                ? 'AbortMultipartUpload'
                : `${req.method}Object`;
      requests.push(operation);
      if (bucketName !== bucket) return xml(res, 404, '<Error><Code>NoSuchBucket</Code></Error>');

      switch (operation) {
        case 'PUTObject':
          objects.set(key, body);
          res.writeHead(200, { ETag: etag(body) }).end();
          return;
        case 'GETObject': {
          const object = objects.get(key);
          if (!object)
            return xml(
              res,
              404,
              '<Error><Code>NoSuchKey</Code><Message>The specified key does not exist.</Message></Error>',
            );
          res
            .writeHead(200, {
              'Content-Length': object.length,
              ETag: etag(object),
              'Content-Type': 'application/octet-stream',
            })
            .end(object);
          return;
        }
        case 'DELETEObject':
          objects.delete(key);
          res.writeHead(204).end();
          return;
        case 'CreateMultipartUpload': {
          const uploadId = randomUUID();
          uploads.set(uploadId, { key, parts: new Map() });
          return xml(
            res,
            200,
            `<InitiateMultipartUploadResult><Bucket>${bucket}</Bucket><Key>${key}</Key><UploadId>${uploadId}</UploadId></InitiateMultipartUploadResult>`,
          );
        }
        case 'UploadPart': {
          const upload = uploads.get(query.get('uploadId') ?? '');
          if (!upload) return xml(res, 404, '<Error><Code>NoSuchUpload</Code></Error>');
          upload.parts.set(Number(query.get('partNumber')), body);
          res.writeHead(200, { ETag: etag(body) }).end();
          return;
        }
        case 'CompleteMultipartUpload': {
          const uploadId = query.get('uploadId') ?? '';
          const upload = uploads.get(uploadId);
          if (!upload) return xml(res, 404, '<Error><Code>NoSuchUpload</Code></Error>');
          const numbers = [...body.toString('utf8').matchAll(/<PartNumber>(\d+)<\/PartNumber>/g)].map((m) =>
            Number(m[1]),
          );
          const whole = Buffer.concat(numbers.map((n) => upload.parts.get(n) ?? Buffer.alloc(0)));
          objects.set(upload.key, whole);
          uploads.delete(uploadId);
          return xml(
            res,
            200,
            `<CompleteMultipartUploadResult><Bucket>${bucket}</Bucket><Key>${upload.key}</Key><ETag>${etag(whole)}</ETag></CompleteMultipartUploadResult>`,
          );
        }
        case 'AbortMultipartUpload':
          uploads.delete(query.get('uploadId') ?? '');
          res.writeHead(204).end();
          return;
        default:
          return xml(res, 501, '<Error><Code>NotImplemented</Code></Error>');
      }
    } catch (error) {
      res.writeHead(500).end(String(error));
    }
  });
  await new Promise<void>((resolve) => server.listen(0, '127.0.0.1', resolve));
  const { port } = server.address() as AddressInfo;
  return {
    endpoint: `http://127.0.0.1:${port}`,
    objects,
    requests,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}

function xml(res: import('node:http').ServerResponse, status: number, body: string) {
  res
    .writeHead(status, { 'Content-Type': 'application/xml' })
    .end(`<?xml version="1.0" encoding="UTF-8"?>${body}`);
}

const etag = (body: Buffer) => `"${createHash('md5').update(body).digest('hex')}"`;

/** The request body; an aws-chunked body (streamed uploads with trailing checksums) is unwrapped. */
async function readBody(req: IncomingMessage): Promise<Buffer> {
  const chunks: Buffer[] = [];
  for await (const chunk of req) chunks.push(chunk as Buffer);
  const raw = Buffer.concat(chunks);
  if (!String(req.headers['content-encoding'] ?? '').includes('aws-chunked')) return raw;
  const parts: Buffer[] = [];
  let offset = 0;
  while (offset < raw.length) {
    const lineEnd = raw.indexOf('\r\n', offset);
    const size = parseInt(raw.subarray(offset, lineEnd).toString('latin1').split(';')[0], 16);
    if (!size) break;
    parts.push(raw.subarray(lineEnd + 2, lineEnd + 2 + size));
    offset = lineEnd + 2 + size + 2;
  }
  return Buffer.concat(parts);
}
