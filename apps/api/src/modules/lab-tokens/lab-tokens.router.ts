import { Router, type RequestHandler } from 'express';
import { labApiTokenCreateSchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf, requireRole } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { createLabToken, listLabTokens, revokeLabToken } from './lab-tokens.service.ts';

/** A supervisor manages their lab's API tokens (the coordinator may too, for any lab). */
export function labTokensRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const managers = [requireUser, requireRole('supervisor', 'coordinator')];

  router.get('/labs/:labId/api-tokens', ...managers, async (req, res) => {
    res.json(await listLabTokens(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.post('/labs/:labId/api-tokens', ...managers, async (req, res) => {
    const input = parseInput(labApiTokenCreateSchema, req.body);
    res.status(201).json(await createLabToken(deps.db, principalOf(req), String(req.params.labId), input));
  });

  router.delete('/labs/:labId/api-tokens/:tokenId', ...managers, async (req, res) => {
    await revokeLabToken(deps.db, principalOf(req), String(req.params.labId), String(req.params.tokenId));
    res.status(204).end();
  });

  return router;
}
