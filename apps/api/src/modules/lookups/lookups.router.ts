import { Router, type RequestHandler } from 'express';
import type { ControlLotSummary, Period, Procedure } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { assertLabAccess, principalOf } from '../../auth/authenticate.ts';
import { notFound } from '../../errors/app-error.ts';
import * as repo from './lookups.repository.ts';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Read-only lists every signed-in user needs to upload and read reports: periods, procedures, control lots. */
export function lookupsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();

  router.get('/periods', requireUser, async (_req, res) => {
    const rows = await repo.listPeriods(deps.db);
    const body: Period[] = rows.map((r) => ({
      period: r.period,
      state: r.state,
      deadline: r.deadline.toISOString(),
    }));
    res.json(body);
  });

  router.get('/labs/:labId/procedures', requireUser, async (req, res) => {
    const labId = String(req.params.labId);
    assertLabAccess(principalOf(req), labId);
    if (!UUID.test(labId) || !(await repo.labExists(deps.db, labId))) throw notFound('Lab');
    const body: Procedure[] = await repo.listLabProcedures(deps.db, labId);
    res.json(body);
  });

  router.get('/control-lots', requireUser, async (_req, res) => {
    const rows = await repo.listControlLots(deps.db);
    const body: ControlLotSummary[] = rows.map((r) => ({
      ...r,
      levels: [...r.levels].sort((a, b) => a - b),
    }));
    res.json(body);
  });

  return router;
}
