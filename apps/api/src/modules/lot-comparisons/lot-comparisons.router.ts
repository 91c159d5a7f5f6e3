import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { requireRole } from '../../auth/authenticate.ts';
import * as service from './lot-comparisons.service.ts';

/**
 * Lot-to-lot comparisons for the coordinator: per level of an analyte, whether the lab means moved
 * with a control lot change across the network. Coordinator only.
 */
export function lotComparisonsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  router.get('/lot-comparisons', requireUser, requireRole('coordinator'), async (req, res) => {
    res.json(await service.lotComparisons(deps.db, req.query));
  });
  return router;
}
