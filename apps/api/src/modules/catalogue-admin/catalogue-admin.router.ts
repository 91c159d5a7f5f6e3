import { Router, type Request, type RequestHandler } from 'express';
import {
  catalogueImportQuerySchema,
  catalogueListSchema,
  catalogueLists,
  type CatalogueList,
} from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import { AppError } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import {
  createCatalogueEntry,
  listCatalogue,
  setCatalogueEntryRetired,
  updateCatalogueEntry,
} from './catalogue-admin.service.ts';
import { importCatalogueCsv } from './catalogue-import.ts';
import { readCsvBody } from './csv-body.ts';

function listOf(req: Request): CatalogueList {
  const parsed = catalogueListSchema.safeParse(req.params.list);
  if (!parsed.success) {
    throw new AppError(
      'not_found',
      `No catalogue list "${String(req.params.list)}"; the lists are ${catalogueLists.join(', ')}.`,
    );
  }
  return parsed.data;
}

/** The coordinator's catalogue: list, create, edit, retire/restore and CSV import, for each list. */
export function catalogueAdminRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];

  // The catalogue is shared by the network: lab members may read its active entries (to register a
  // procedure); retired entries and every change stay with the coordinator.
  router.get('/catalogue/:list', requireUser, async (req, res) => {
    const query = principalOf(req).role === 'coordinator' ? req.query : { ...req.query, state: 'active' };
    res.json(await listCatalogue(deps.db, listOf(req), query));
  });

  router.post('/catalogue/:list', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await createCatalogueEntry(deps.db, principalOf(req), listOf(req), req.body));
  });

  router.post('/catalogue/:list/import', ...coordinatorOnly, async (req, res) => {
    const list = listOf(req);
    const { dryRun } = parseInput(catalogueImportQuerySchema, req.query, 'query');
    const text = await readCsvBody(req);
    res.json(await importCatalogueCsv(deps.db, principalOf(req), list, text, dryRun));
  });

  router.patch('/catalogue/:list/:id', ...coordinatorOnly, async (req, res) => {
    res.json(
      await updateCatalogueEntry(deps.db, principalOf(req), listOf(req), String(req.params.id), req.body),
    );
  });

  router.post('/catalogue/:list/:id/retire', ...coordinatorOnly, async (req, res) => {
    res.json(
      await setCatalogueEntryRetired(
        deps.db,
        principalOf(req),
        listOf(req),
        String(req.params.id),
        req.body,
        true,
      ),
    );
  });

  router.post('/catalogue/:list/:id/restore', ...coordinatorOnly, async (req, res) => {
    res.json(
      await setCatalogueEntryRetired(
        deps.db,
        principalOf(req),
        listOf(req),
        String(req.params.id),
        req.body,
        false,
      ),
    );
  });

  return router;
}
