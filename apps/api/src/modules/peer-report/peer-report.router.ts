import { Router, type RequestHandler } from 'express';
import { peerReportQuerySchema, type PeerReport } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { createSingleFlight } from '../../http/single-flight.ts';
import { buildPeerReport } from './peer-report.service.ts';

export function peerReportRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  // Many readers of one lab's report (a lab's staff, dashboards) share the computation in progress.
  // Callers with the same role and lab get the same access decision and the same report.
  const shared = createSingleFlight<PeerReport>();
  router.get('/labs/:labId/peer-report', requireUser, async (req, res) => {
    const query = parseInput(peerReportQuerySchema, req.query, 'query');
    const principal = principalOf(req);
    const labId = String(req.params.labId);
    const key = JSON.stringify([
      principal.kind,
      principal.role,
      principal.labId,
      labId,
      query.period,
      query.units ?? null,
    ]);
    res.json(
      await shared(key, () =>
        buildPeerReport(deps.db, principal, labId, query.period, { units: query.units }),
      ),
    );
  });
  return router;
}
