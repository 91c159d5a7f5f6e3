import { Router } from 'express';
import { join } from 'node:path';
import type { AppDeps } from '../deps.ts';
import { buildOpenApiDocument } from './document.ts';

const referenceDir = join(import.meta.dirname, 'reference');

/** The OpenAPI document and a self-contained reference page that renders it (no outside resources). */
export function openApiRouter(deps: AppDeps): Router {
  const router = Router();
  let document: ReturnType<typeof buildOpenApiDocument> | null = null;

  router.get('/openapi.json', (_req, res) => {
    document ??= buildOpenApiDocument(deps.env.PUBLIC_URL);
    res.json(document);
  });
  router.get('/reference', (_req, res) => res.sendFile(join(referenceDir, 'index.html')));
  router.get('/reference.js', (_req, res) =>
    res.type('text/javascript').sendFile(join(referenceDir, 'reference.js')),
  );
  router.get('/reference.css', (_req, res) =>
    res.type('text/css').sendFile(join(referenceDir, 'reference.css')),
  );
  return router;
}
