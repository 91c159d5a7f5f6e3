import { createHmac, timingSafeEqual } from 'node:crypto';
import type { CookieOptions, Request, RequestHandler, Response } from 'express';
import { forbidden } from '../errors/app-error.ts';

/**
 * The browser session: the signed JWT in an httpOnly, SameSite=Strict cookie (Secure over HTTPS), so
 * page scripts never see it. State-changing requests that rely on the cookie must also carry the CSRF
 * token (double submit): the readable `plumbline_csrf` cookie, echoed in the `X-CSRF-Token` header.
 * The token is an HMAC of the session, so it cannot be forged without the server's secret.
 * Requests with an `Authorization: Bearer` header are not cookie-based and need no CSRF token.
 */
export const SESSION_COOKIE = 'plumbline_session';
export const CSRF_COOKIE = 'plumbline_csrf';
export const CSRF_HEADER = 'x-csrf-token';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
// Public routes do not act on a session, so a stale cookie (e.g. after the secret changed) must not
// block signing in again or accepting an invitation.
const PUBLIC_WRITES = new Set(['/auth/login', '/invitations/accept']);

export const csrfTokenFor = (secret: string, sessionToken: string) =>
  createHmac('sha256', secret).update(`csrf:${sessionToken}`).digest('base64url');

function cookieOptions(req: Request, publicUrl: string, expiresAt: Date): CookieOptions {
  return {
    sameSite: 'strict',
    secure: req.secure || publicUrl.startsWith('https:'),
    expires: expiresAt,
    path: '/',
  };
}

export function setSessionCookies(
  req: Request,
  res: Response,
  settings: { secret: string; publicUrl: string },
  session: { token: string; expiresAt: Date },
): string {
  const options = cookieOptions(req, settings.publicUrl, session.expiresAt);
  const csrf = csrfTokenFor(settings.secret, session.token);
  res.cookie(SESSION_COOKIE, session.token, { ...options, httpOnly: true, path: '/api' });
  res.cookie(CSRF_COOKIE, csrf, { ...options, httpOnly: false });
  return csrf;
}

export function clearSessionCookies(req: Request, res: Response, publicUrl: string): void {
  const options = cookieOptions(req, publicUrl, new Date(0));
  res.clearCookie(SESSION_COOKIE, { ...options, expires: undefined, httpOnly: true, path: '/api' });
  res.clearCookie(CSRF_COOKIE, { ...options, expires: undefined });
}

/** The session token from the cookie, when the request carries no Authorization header. */
export function sessionTokenFromCookie(req: Request): string | null {
  if (req.headers.authorization) return null;
  const value = (req.cookies as Record<string, unknown> | undefined)?.[SESSION_COOKIE];
  return typeof value === 'string' && value.length > 0 ? value : null;
}

/** Refuses a cookie-authenticated state-changing request whose CSRF header does not match its session. */
export function requireCsrf(secret: string): RequestHandler {
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method) || PUBLIC_WRITES.has(req.path)) return next();
    const session = sessionTokenFromCookie(req);
    if (!session) return next();
    const sent = req.get(CSRF_HEADER) ?? '';
    const expected = csrfTokenFor(secret, session);
    const ok = sent.length === expected.length && timingSafeEqual(Buffer.from(sent), Buffer.from(expected));
    if (!ok) {
      return next(
        forbidden(
          'This request is missing its CSRF token (X-CSRF-Token header). Reload the page and try again.',
        ),
      );
    }
    next();
  };
}
