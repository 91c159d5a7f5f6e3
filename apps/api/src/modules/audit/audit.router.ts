import { Router, type RequestHandler } from 'express';
import { auditQuerySchema, toCsv } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { requireRole } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { listAuditEvents } from './audit.repository.ts';

/** The audit log, for the coordinator: filters by actor, lab, kind and date range; CSV export. */
export function auditRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();
  const coordinatorOnly = [requireUser, requireRole('coordinator')];

  router.get('/audit-events', ...coordinatorOnly, async (req, res) => {
    const query = parseInput(auditQuerySchema, req.query, 'query');
    res.json(await listAuditEvents(deps.db, query));
  });

  router.get('/audit-events.csv', ...coordinatorOnly, async (req, res) => {
    const query = parseInput(auditQuerySchema, { ...req.query, limit: 500 }, 'query');
    const items = [];
    for (let offset = 0; ; offset += 500) {
      const page = await listAuditEvents(deps.db, { ...query, offset, limit: 500 });
      items.push(...page.items);
      if (page.items.length < 500 || offset > 100_000) break;
    }
    res.setHeader('Content-Type', 'text/csv; charset=utf-8');
    res.setHeader('Content-Disposition', 'attachment; filename="audit-log.csv"');
    res.send(
      toCsv(
        ['at', 'actor', 'actor_email', 'actor_label', 'lab', 'kind', 'entity', 'entity_id', 'details'],
        items.map((e) => [
          e.at,
          e.actor?.name,
          e.actor?.email,
          e.actorLabel,
          e.lab?.code,
          e.kind,
          e.entity,
          e.entityId,
          JSON.stringify(e.details),
        ]),
      ),
    );
  });

  return router;
}
