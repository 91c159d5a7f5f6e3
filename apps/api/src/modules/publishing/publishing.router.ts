import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import { listPublications, publishFirst, republish } from './publishing.service.ts';

/** Publishing a closed period (version 1), republishing it with a reason (the next version), and the versions so far. Coordinator only. */
export function publishingRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];

  router.post('/periods/:period/publish', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await publishFirst(deps.db, principalOf(req), String(req.params.period), req.body));
  });
  router.post('/periods/:period/republish', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await republish(deps.db, principalOf(req), String(req.params.period), req.body));
  });
  router.get('/periods/:period/publications', ...coordinatorOnly, async (req, res) => {
    res.json(await listPublications(deps.db, String(req.params.period)));
  });

  return router;
}
