import { Router, type RequestHandler } from 'express';
import type { Readable } from 'node:stream';
import { columnMappingUpdateSchema, uploadListQuerySchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { readMultipart, tooLarge } from '../../http/multipart.ts';
import { uploadStorageKey, type StoredObject } from '../../storage/storage.ts';
import {
  PREVIEW_BYTES,
  cancelUpload,
  confirmUpload,
  getColumnMapping,
  getUploadDetail,
  listLabUploads,
  newUploadId,
  previewUpload,
  putColumnMapping,
  receiveUpload,
} from './uploads.service.ts';
import { badRequest } from '../../errors/app-error.ts';

/**
 * Uploads of QC files and the lab's saved column mappings. `requireUploader` also accepts lab API
 * tokens (POST /uploads and GET /uploads/:id only); everything else needs a signed-in user.
 */
export function uploadsRouter(
  deps: AppDeps,
  auth: { requireUser: RequestHandler; requireUploader: RequestHandler },
): Router {
  const router = Router();
  const { requireUser, requireUploader } = auth;

  router.post('/uploads', requireUploader, async (req, res) => {
    const principal = principalOf(req);
    const uploadId = newUploadId();
    const key = uploadStorageKey(uploadId);
    const body = await readMultipart<StoredObject>(req, {
      fileField: 'file',
      maxFileBytes: deps.env.MAX_UPLOAD_BYTES,
      handleFile: (stream) => deps.storage.write(key, stream, { maxBytes: deps.env.MAX_UPLOAD_BYTES }),
      discard: (stored) => deps.storage.delete(stored.key),
    });
    if (!body.file) throw badRequest('No file was sent: put the CSV file in the "file" field.');
    if (body.file.truncated) {
      await deps.storage.delete(key).catch(() => {});
      throw tooLarge(deps.env.MAX_UPLOAD_BYTES);
    }
    const created = await receiveUpload(deps, principal, {
      uploadId,
      fields: body.fields,
      filename: body.file.filename,
      stored: body.file.result,
    });
    res.status(202).json(created);
  });

  router.post('/uploads/preview', requireUser, async (req, res) => {
    const principal = principalOf(req);
    const body = await readMultipart<{ head: Buffer; complete: boolean }>(req, {
      fileField: 'file',
      maxFileBytes: deps.env.MAX_UPLOAD_BYTES,
      handleFile: (stream) => readHead(stream, PREVIEW_BYTES),
    });
    if (!body.file)
      throw badRequest('No file was sent: put the CSV file (or its first lines) in the "file" field.');
    res.json(
      await previewUpload(deps, principal, {
        fields: body.fields,
        head: body.file.result.head,
        complete: body.file.result.complete,
        filename: body.file.filename,
      }),
    );
  });

  router.get('/uploads', requireUser, async (req, res) => {
    const query = parseInput(uploadListQuerySchema, req.query, 'query');
    res.json(await listLabUploads(deps, principalOf(req), query.labId));
  });

  router.get('/uploads/:id', requireUploader, async (req, res) => {
    res.json(await getUploadDetail(deps, principalOf(req), String(req.params.id)));
  });

  router.post('/uploads/:id/confirm', requireUser, async (req, res) => {
    res.json(await confirmUpload(deps, principalOf(req), String(req.params.id)));
  });

  router.post('/uploads/:id/cancel', requireUser, async (req, res) => {
    res.json(await cancelUpload(deps, principalOf(req), String(req.params.id)));
  });

  router.get('/labs/:labId/column-mappings/:kind', requireUser, async (req, res) => {
    res.json(
      await getColumnMapping(deps, principalOf(req), String(req.params.labId), String(req.params.kind)),
    );
  });

  router.put('/labs/:labId/column-mappings/:kind', requireUser, async (req, res) => {
    const input = parseInput(columnMappingUpdateSchema, req.body);
    res.json(
      await putColumnMapping(
        deps,
        principalOf(req),
        String(req.params.labId),
        String(req.params.kind),
        input.mapping,
      ),
    );
  });

  return router;
}

/** The first `limit` bytes of a stream; the rest is read and dropped. `complete` when the stream ended within the limit. */
async function readHead(stream: Readable, limit: number): Promise<{ head: Buffer; complete: boolean }> {
  const chunks: Buffer[] = [];
  let size = 0;
  let complete = true;
  for await (const chunk of stream) {
    const buffer = chunk as Buffer;
    if (size < limit) {
      chunks.push(buffer.subarray(0, limit - size));
      if (size + buffer.length > limit) complete = false;
      size = Math.min(limit, size + buffer.length);
    } else {
      complete = false;
    }
  }
  return { head: Buffer.concat(chunks), complete };
}
