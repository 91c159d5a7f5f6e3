import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { labOverview } from './lab-overview.service.ts';

/** GET /labs/:labId/overview: the lab's current period, flags, uploads and what needs attention. */
export function labOverviewRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  router.get('/labs/:labId/overview', requireUser, async (req, res) => {
    res.json(await labOverview(deps, principalOf(req), String(req.params.labId)));
  });
  return router;
}
