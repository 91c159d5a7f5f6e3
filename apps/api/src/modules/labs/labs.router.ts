import { Router } from 'express';
import { asc, eq } from 'drizzle-orm';
import { labs } from '@plumbline/db';
import type { AppDeps } from '../../deps.ts';
import type { RequestHandler } from 'express';
import { assertLabAccess, principalOf } from '../../auth/authenticate.ts';
import { notFound } from '../../errors/app-error.ts';

/** GET /labs: the coordinator sees every lab, everyone else only their own. */
export function labsRouter(deps: AppDeps, requireUser: RequestHandler): Router {
  const router = Router();

  router.get('/labs', requireUser, async (req, res) => {
    const principal = principalOf(req);
    const base = deps.db
      .select({ id: labs.id, code: labs.code, name: labs.name, active: labs.active })
      .from(labs);
    const rows =
      principal.role === 'coordinator'
        ? await base.orderBy(asc(labs.code))
        : principal.labId
          ? await base.where(eq(labs.id, principal.labId))
          : [];
    res.json(rows);
  });

  router.get('/labs/:labId', requireUser, async (req, res) => {
    const principal = principalOf(req);
    const labId = String(req.params.labId);
    assertLabAccess(principal, labId);
    const [lab] = /^[0-9a-f-]{36}$/i.test(labId)
      ? await deps.db.select().from(labs).where(eq(labs.id, labId)).limit(1)
      : [];
    if (!lab) throw notFound('Lab');
    res.json({
      id: lab.id,
      code: lab.code,
      name: lab.name,
      active: lab.active,
      preferredUnits: lab.preferredUnits,
    });
  });

  return router;
}
