import { Router } from 'express';
import type passport from 'passport';
import { loginRequestSchema } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { parseInput } from '../../http/validate.ts';
import { authenticate, principalOf } from '../../auth/authenticate.ts';
import { forbidden } from '../../errors/app-error.ts';
import { currentUser, signIn, signOut } from './auth.service.ts';

export function authRouter(deps: AppDeps, passportInstance: passport.PassportStatic): Router {
  const router = Router();
  const requireUser = authenticate(deps.db, passportInstance);

  router.post('/auth/login', async (req, res) => {
    const input = parseInput(loginRequestSchema, req.body);
    res.json(await signIn(deps.db, input, deps.env.JWT_SECRET, deps.env.JWT_TTL_SECONDS));
  });

  router.post('/auth/logout', requireUser, async (req, res) => {
    const principal = principalOf(req);
    if (principal.kind !== 'user') throw forbidden();
    await signOut(deps.db, principal);
    res.status(204).end();
  });

  router.get('/me', requireUser, async (req, res) => {
    const principal = principalOf(req);
    if (principal.kind !== 'user') throw forbidden();
    res.json(await currentUser(deps.db, principal.userId));
  });

  return router;
}
