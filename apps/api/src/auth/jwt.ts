import jwt from 'jsonwebtoken';
import { randomUUID } from 'node:crypto';
import type { Role } from '@plumbline/contracts';

export type SessionClaims = { sub: string; role: Role; labId: string | null; jti: string; exp: number };

export function signSession(
  user: { id: string; role: Role; labId: string | null },
  secret: string,
  ttlSeconds: number,
): { token: string; expiresAt: Date } {
  const jti = randomUUID();
  const token = jwt.sign({ role: user.role, labId: user.labId }, secret, {
    subject: user.id,
    jwtid: jti,
    expiresIn: ttlSeconds,
    algorithm: 'HS256',
  });
  return { token, expiresAt: new Date(Date.now() + ttlSeconds * 1000) };
}
