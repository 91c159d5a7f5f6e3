import { Router, type RequestHandler } from 'express';
import { peerReportQuerySchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { buildPeerReport } from './peer-report.service.ts';

export function peerReportRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  router.get('/labs/:labId/peer-report', requireUser, async (req, res) => {
    const query = parseInput(peerReportQuerySchema, req.query, 'query');
    res.json(
      await buildPeerReport(deps.db, principalOf(req), String(req.params.labId), query.period, {
        units: query.units,
      }),
    );
  });
  return router;
}
