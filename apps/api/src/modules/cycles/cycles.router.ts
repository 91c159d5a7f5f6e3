import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import {
  changeDeadline,
  closePeriod,
  createPeriod,
  participationBoard,
  reopenPeriod,
} from './cycles.service.ts';

/**
 * Monthly cycles for the coordinator: create a period, move its deadline, close and reopen it, and
 * watch participation. Listing periods (GET /periods) and publishing live elsewhere.
 */
export function cyclesRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];

  router.post('/periods', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await createPeriod(deps.db, principalOf(req), req.body));
  });

  router.patch('/periods/:period', ...coordinatorOnly, async (req, res) => {
    res.json(await changeDeadline(deps.db, principalOf(req), String(req.params.period), req.body));
  });

  router.post('/periods/:period/close', ...coordinatorOnly, async (req, res) => {
    res.json(await closePeriod(deps.db, principalOf(req), String(req.params.period), req.body));
  });

  router.post('/periods/:period/reopen', ...coordinatorOnly, async (req, res) => {
    res.json(await reopenPeriod(deps.db, principalOf(req), String(req.params.period), req.body));
  });

  router.get('/periods/:period/participation', ...coordinatorOnly, async (req, res) => {
    res.json(await participationBoard(deps.db, String(req.params.period), req.query));
  });

  return router;
}
