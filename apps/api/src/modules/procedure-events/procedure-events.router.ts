import express, { Router, type RequestHandler } from 'express';
import { procedureEventCreateSchema, qcPlanInputSchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import {
  importProcedureEvents,
  listProcedureEvents,
  recordProcedureEvent,
} from './procedure-events.service.ts';
import { procedureShifts } from './procedure-shifts.service.ts';
import { qcPlanPage, saveQcPlan } from './qc-plan.service.ts';

/**
 * Events of a lab's procedures (reagent or calibrator lot changes, maintenance, ...): read by the lab's
 * members and the coordinator; recorded by the lab's analysts and supervisors, one at a time or as CSV
 * from middleware with a lab API token. The shifts of a procedure's SDI series, annotated with them.
 */
export function procedureEventsRouter(
  deps: AppDeps,
  auth: { requireUser: RequestHandler; requireUserOrToken: RequestHandler },
): Router {
  const router = Router();
  const { requireUser, requireUserOrToken } = auth;

  router.get('/labs/:labId/procedure-events', requireUser, async (req, res) => {
    res.json(await listProcedureEvents(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.post(
    '/labs/:labId/procedure-events',
    requireUserOrToken,
    express.text({ type: ['text/csv', 'text/plain'], limit: '1mb' }),
    async (req, res) => {
      res
        .status(201)
        .json(await importProcedureEvents(deps.db, principalOf(req), String(req.params.labId), req.body));
    },
  );

  router.get('/labs/:labId/procedures/:procedureId/events', requireUser, async (req, res) => {
    res.json(
      await listProcedureEvents(
        deps.db,
        principalOf(req),
        String(req.params.labId),
        String(req.params.procedureId),
      ),
    );
  });

  router.post('/labs/:labId/procedures/:procedureId/events', requireUserOrToken, async (req, res) => {
    const input = parseInput(procedureEventCreateSchema, req.body);
    res
      .status(201)
      .json(
        await recordProcedureEvent(
          deps.db,
          principalOf(req),
          String(req.params.labId),
          String(req.params.procedureId),
          input,
        ),
      );
  });

  router.get('/labs/:labId/procedures/:procedureId/shifts', requireUser, async (req, res) => {
    res.json(
      await procedureShifts(
        deps.db,
        principalOf(req),
        String(req.params.labId),
        String(req.params.procedureId),
        {
          controlLotId: typeof req.query.controlLotId === 'string' ? req.query.controlLotId : undefined,
          level:
            typeof req.query.level === 'string' && /^\d{1,2}$/.test(req.query.level)
              ? Number(req.query.level)
              : undefined,
        },
      ),
    );
  });

  router.get('/labs/:labId/qc-plan', requireUser, async (req, res) => {
    res.json(await qcPlanPage(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.put('/labs/:labId/qc-plan/:procedureId/:level', requireUser, async (req, res) => {
    const input = parseInput(qcPlanInputSchema, req.body);
    await saveQcPlan(
      deps.db,
      principalOf(req),
      String(req.params.labId),
      String(req.params.procedureId),
      String(req.params.level),
      input,
    );
    res.status(204).end();
  });

  return router;
}
