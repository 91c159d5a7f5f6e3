import passport from 'passport';
import { ExtractJwt, Strategy as JwtStrategy } from 'passport-jwt';
import type { Request, RequestHandler } from 'express';
import { and, eq, isNull } from 'drizzle-orm';
import { labApiTokens, labs, revokedSessions, users, type Database } from '@plumbline/db';
import type { Role } from '@plumbline/contracts';
import { AppError, forbidden, notFound, unauthenticated } from '../errors/app-error.ts';
import type { Principal } from './principal.ts';
import { hashLabToken, looksLikeLabToken } from './lab-tokens.ts';
import type { SessionClaims } from './jwt.ts';
import { sessionTokenFromCookie } from './session-cookie.ts';

/** Registers the JWT strategy: signature, expiry, sign-out list and an active account are all checked. */
export function configurePassport(db: Database, secret: string): passport.PassportStatic {
  const instance = new passport.Passport() as unknown as passport.PassportStatic;
  instance.use(
    new JwtStrategy(
      {
        // A bearer header (scripts, tests) or the browser's httpOnly session cookie.
        jwtFromRequest: ExtractJwt.fromExtractors([
          ExtractJwt.fromAuthHeaderAsBearerToken(),
          (req) => sessionTokenFromCookie(req as Request),
        ]),
        secretOrKey: secret,
        algorithms: ['HS256'],
      },
      (claims: SessionClaims, done: (err: unknown, user?: Express.User | false, info?: unknown) => void) => {
        userFromClaims(db, claims).then(
          (principal) => done(null, principal ? { principal } : false, principal ? undefined : 'revoked'),
          (err) => done(err),
        );
      },
    ),
  );
  return instance;
}

async function userFromClaims(db: Database, claims: SessionClaims): Promise<Principal | null> {
  const [revoked] = await db
    .select()
    .from(revokedSessions)
    .where(eq(revokedSessions.jti, claims.jti))
    .limit(1);
  if (revoked) return null;
  const [row] = await db
    .select({ user: users, labActive: labs.active })
    .from(users)
    .leftJoin(labs, eq(labs.id, users.labId))
    .where(eq(users.id, claims.sub))
    .limit(1);
  const user = row?.user;
  // A deactivated account, or an account of a deactivated lab, can no longer act.
  if (!user || !user.active || row.labActive === false) return null;
  return {
    kind: 'user',
    userId: user.id,
    role: user.role,
    labId: user.labId,
    jti: claims.jti,
    expiresAt: new Date(claims.exp * 1000),
  };
}

async function principalFromLabToken(db: Database, token: string): Promise<Principal | null> {
  const rows = await db
    .select({ id: labApiTokens.id, labId: labApiTokens.labId, labActive: labs.active })
    .from(labApiTokens)
    .innerJoin(labs, eq(labs.id, labApiTokens.labId))
    .where(and(eq(labApiTokens.tokenHash, hashLabToken(token)), isNull(labApiTokens.revokedAt)))
    .limit(1);
  const row = rows[0];
  if (!row || !row.labActive) return null;
  await db.update(labApiTokens).set({ lastUsedAt: new Date() }).where(eq(labApiTokens.id, row.id));
  return { kind: 'lab-token', tokenId: row.id, role: 'analyst', labId: row.labId };
}

function bearerToken(header: string | undefined): string | null {
  const match = /^Bearer\s+(\S+)$/i.exec(header ?? '');
  return match ? match[1] : null;
}

/**
 * Requires a signed-in user (or, with `allowLabTokens`, a lab API token). Missing, expired, tampered or
 * signed-out credentials all give 401.
 */
export function authenticate(
  db: Database,
  instance: passport.PassportStatic,
  options: { allowLabTokens?: boolean } = {},
): RequestHandler {
  return (req, res, next) => {
    const bearer = bearerToken(req.headers.authorization);
    const token = bearer ?? sessionTokenFromCookie(req);
    if (!token) return next(unauthenticated('Sign in to continue: no session token was sent.'));
    // Lab API tokens are machine credentials: accepted as a bearer header only, never from a cookie.
    if (bearer && looksLikeLabToken(bearer)) {
      if (!options.allowLabTokens)
        return next(forbidden('Lab API tokens may only upload files and record procedure events.'));
      principalFromLabToken(db, token).then((principal) => {
        if (!principal) return next(unauthenticated('This lab API token is unknown or has been revoked.'));
        req.user = { principal };
        next();
      }, next);
      return;
    }
    instance.authenticate(
      'jwt',
      { session: false },
      (err: unknown, user: Express.User | false, info: unknown) => {
        if (err) return next(err);
        if (!user) {
          const name = info instanceof Error ? info.name : '';
          const message =
            name === 'TokenExpiredError'
              ? 'Your session has expired. Sign in again.'
              : info === 'revoked'
                ? 'This session has ended. Sign in again.'
                : 'Your session token is not valid. Sign in again.';
          return next(unauthenticated(message));
        }
        req.user = user;
        next();
      },
    )(req, res, next);
  };
}

export function principalOf(req: { user?: Express.User }): Principal {
  const principal = req.user?.principal;
  if (!principal) throw new AppError('unauthenticated', 'Sign in to continue.');
  return principal;
}

/** Wrong role → 403. */
export function requireRole(...roles: Role[]): RequestHandler {
  return (req, _res, next) => {
    const principal = principalOf(req);
    if (!roles.includes(principal.role)) {
      return next(forbidden(`This action needs the ${roles.join(' or ')} role.`));
    }
    next();
  };
}

/**
 * The one lab-scoping rule: the coordinator sees every lab; everyone else only their own.
 * Another lab's resource answers 404, so its existence is not revealed.
 */
export function assertLabAccess(principal: Principal, labId: string, what = 'Lab'): void {
  if (principal.role === 'coordinator') return;
  if (principal.labId !== labId) throw notFound(what);
}

/** The lab a request acts for: the caller's own lab, or (coordinator only) the one asked for. */
export function labScope(principal: Principal, requestedLabId?: string | null): string | null {
  if (principal.role === 'coordinator') return requestedLabId ?? null;
  if (requestedLabId && requestedLabId !== principal.labId) throw notFound('Lab');
  return principal.labId;
}
