import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { requireRole } from '../../auth/authenticate.ts';
import { listRecomputeFailures } from './recompute-failures.service.ts';

/** GET /peer-groups/failures: peer groups the last recompute could not compute, with the reason. Coordinator only. */
export function recomputeFailuresRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  router.get('/peer-groups/failures', requireUser, requireRole('coordinator'), async (req, res) => {
    res.json(await listRecomputeFailures(deps.db, req.query));
  });
  return router;
}
