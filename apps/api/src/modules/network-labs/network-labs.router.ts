import { Router, type RequestHandler } from 'express';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import {
  acceptInvitation,
  deactivateLab,
  describeInvitation,
  editLab,
  enrolLab,
  inviteUser,
  networkProcedures,
  updateLabUser,
  usersOfLab,
} from './network-labs.service.ts';

/**
 * Enrolling and editing labs and reading procedures across the network (coordinator); lab users and
 * invitations (coordinator for any lab, a supervisor for their own); accepting an invitation (public).
 * GET /labs and GET /labs/:labId live in the labs module.
 */
export function networkLabsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];
  const labManagers = [requireUser, requireRole('coordinator', 'supervisor')];

  router.post('/labs', ...coordinatorOnly, async (req, res) => {
    res.status(201).json(await enrolLab(deps.db, principalOf(req), req.body));
  });

  router.patch('/labs/:labId', ...coordinatorOnly, async (req, res) => {
    res.json(await editLab(deps.db, principalOf(req), String(req.params.labId), req.body));
  });

  router.post('/labs/:labId/deactivate', ...coordinatorOnly, async (req, res) => {
    res.json(await deactivateLab(deps.db, principalOf(req), String(req.params.labId), req.body));
  });

  router.get('/labs/:labId/users', ...labManagers, async (req, res) => {
    res.json(await usersOfLab(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.patch('/labs/:labId/users/:userId', ...labManagers, async (req, res) => {
    res.json(
      await updateLabUser(
        deps.db,
        principalOf(req),
        String(req.params.labId),
        String(req.params.userId),
        req.body,
      ),
    );
  });

  router.post('/labs/:labId/invitations', ...labManagers, async (req, res) => {
    res
      .status(201)
      .json(
        await inviteUser(deps.db, principalOf(req), String(req.params.labId), req.body, deps.env.PUBLIC_URL),
      );
  });

  router.get('/invitations/:token', async (req, res) => {
    res.json(await describeInvitation(deps.db, String(req.params.token)));
  });

  router.post('/invitations/accept', async (req, res) => {
    res.json(await acceptInvitation(deps.db, req.body));
  });

  router.get('/network/procedures', ...coordinatorOnly, async (req, res) => {
    res.json(await networkProcedures(deps.db, req.query));
  });

  return router;
}
