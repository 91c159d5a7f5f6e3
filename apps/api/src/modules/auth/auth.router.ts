import { Router } from 'express';
import type passport from 'passport';
import { loginRequestSchema, type LoginResponse } from '@plumbline/contracts';
import type { AppDeps } from '../../deps.ts';
import { parseInput } from '../../http/validate.ts';
import { authenticate, principalOf } from '../../auth/authenticate.ts';
import { AppError, forbidden } from '../../errors/app-error.ts';
import { createSignInThrottle } from '../../auth/sign-in-throttle.ts';
import { clearSessionCookies, setSessionCookies } from '../../auth/session-cookie.ts';
import { currentUser, signIn, signOut } from './auth.service.ts';

export function authRouter(deps: AppDeps, passportInstance: passport.PassportStatic): Router {
  const router = Router();
  const requireUser = authenticate(deps.db, passportInstance);
  const cookieSettings = { secret: deps.env.JWT_SECRET, publicUrl: deps.env.PUBLIC_URL };
  const throttle = createSignInThrottle(deps.redis, deps.env.QUEUE_PREFIX, {
    failuresPerAccount: deps.env.SIGNIN_FAILURES_PER_ACCOUNT,
    failuresPerAddress: deps.env.SIGNIN_FAILURES_PER_ADDRESS,
    windowSeconds: deps.env.SIGNIN_WINDOW_SECONDS,
    lockoutSeconds: deps.env.SIGNIN_LOCKOUT_SECONDS,
    lockoutMaxSeconds: deps.env.SIGNIN_LOCKOUT_MAX_SECONDS,
  });

  router.post('/auth/login', async (req, res) => {
    const input = parseInput(loginRequestSchema, req.body);
    const keys = { account: input.email.toLowerCase(), address: req.ip ?? 'unknown' };
    const waitSeconds = await throttle.lockedFor(keys);
    if (waitSeconds > 0) {
      res.setHeader('Retry-After', String(waitSeconds));
      throw new AppError(
        'too_many_requests',
        `Too many failed sign-in attempts. Try again in ${describeWait(waitSeconds)}.`,
      );
    }
    try {
      const { token, expiresAt, user } = await signIn(
        deps.db,
        input,
        deps.env.JWT_SECRET,
        deps.env.JWT_TTL_SECONDS,
      );
      await throttle.recordSuccess(keys);
      // The token travels only in the httpOnly cookie; the body tells the page who signed in.
      setSessionCookies(req, res, cookieSettings, { token, expiresAt: new Date(expiresAt) });
      res.json({ expiresAt, user } satisfies LoginResponse);
    } catch (err) {
      if (err instanceof AppError && err.code === 'unauthenticated') await throttle.recordFailure(keys);
      throw err;
    }
  });

  router.post('/auth/logout', requireUser, async (req, res) => {
    const principal = principalOf(req);
    if (principal.kind !== 'user') throw forbidden();
    await signOut(deps.db, principal);
    clearSessionCookies(req, res, deps.env.PUBLIC_URL);
    res.status(204).end();
  });

  router.get('/me', requireUser, async (req, res) => {
    const principal = principalOf(req);
    if (principal.kind !== 'user') throw forbidden();
    res.json(await currentUser(deps.db, principal.userId));
  });

  return router;
}

function describeWait(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}
