import { Router, type RequestHandler } from 'express';
import {
  procedureCreateSchema,
  procedureStateChangeSchema,
  procedureUpdateSchema,
} from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { principalOf } from '../../auth/authenticate.ts';
import { parseInput } from '../../http/validate.ts';
import { editProcedure, registerProcedure, setProcedureRetired, testMenu } from './lab-procedures.service.ts';

/**
 * The lab's test menu: every procedure (retired ones too) for lab members; registering, editing, retiring
 * and restoring for the lab's supervisor (and the coordinator). The list of current procedures used for
 * uploads is GET /labs/:labId/procedures in the lookups module.
 */
export function labProceduresRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();

  router.get('/labs/:labId/test-menu', requireUser, async (req, res) => {
    res.json(await testMenu(deps.db, principalOf(req), String(req.params.labId)));
  });

  router.post('/labs/:labId/procedures', requireUser, async (req, res) => {
    const input = parseInput(procedureCreateSchema, req.body);
    res.status(201).json(await registerProcedure(deps.db, principalOf(req), String(req.params.labId), input));
  });

  router.patch('/labs/:labId/procedures/:procedureId', requireUser, async (req, res) => {
    const input = parseInput(procedureUpdateSchema, req.body);
    res.json(
      await editProcedure(
        deps.db,
        principalOf(req),
        String(req.params.labId),
        String(req.params.procedureId),
        input,
      ),
    );
  });

  for (const action of ['retire', 'restore'] as const) {
    router.post(`/labs/:labId/procedures/:procedureId/${action}`, requireUser, async (req, res) => {
      const input = parseInput(procedureStateChangeSchema, req.body ?? {});
      res.json(
        await setProcedureRetired(
          deps.db,
          principalOf(req),
          String(req.params.labId),
          String(req.params.procedureId),
          action === 'retire',
          input.reason,
        ),
      );
    });
  }

  return router;
}
