import { eq } from 'drizzle-orm';
import { labs, recordAudit, revokedSessions, users, type Database } from '@plumbline/db';
import type { LoginRequest, LoginResponse, MeResponse } from '@plumbline/contracts';
import { notFound, unauthenticated } from '../../errors/app-error.ts';
import { verifyPassword } from '../../auth/passwords.ts';
import { signSession } from '../../auth/jwt.ts';

export async function signIn(
  db: Database,
  input: { email: string; password: string } & LoginRequest,
  jwtSecret: string,
  ttlSeconds: number,
): Promise<LoginResponse & { token: string; expiresAt: string }> {
  const [row] = await db
    .select({ user: users, labActive: labs.active })
    .from(users)
    .leftJoin(labs, eq(labs.id, users.labId))
    .where(eq(users.email, input.email.toLowerCase()))
    .limit(1);
  const user = row?.user;
  // The password is always verified (against a dummy hash when there is no account), so the answer
  // takes the same time whether or not the account exists or is active.
  const passwordOk = await verifyPassword(user?.passwordHash ?? null, input.password);
  const ok = user && user.active && row.labActive !== false && passwordOk;
  if (!user || !ok) throw unauthenticated('The e-mail address or password is incorrect.');
  const { token, expiresAt } = signSession(user, jwtSecret, ttlSeconds);
  await recordAudit(db, { kind: 'auth.sign-in', actorId: user.id, labId: user.labId });
  return {
    token,
    expiresAt: expiresAt.toISOString(),
    user: { id: user.id, email: user.email, name: user.name, role: user.role, labId: user.labId },
  };
}

export async function signOut(db: Database, session: { userId: string; jti: string; expiresAt: Date }) {
  await db
    .insert(revokedSessions)
    .values({ jti: session.jti, expiresAt: session.expiresAt })
    .onConflictDoNothing();
  await recordAudit(db, { kind: 'auth.sign-out', actorId: session.userId });
}

export async function currentUser(db: Database, userId: string): Promise<MeResponse> {
  const [row] = await db
    .select({ user: users, lab: { id: labs.id, code: labs.code, name: labs.name } })
    .from(users)
    .leftJoin(labs, eq(labs.id, users.labId))
    .where(eq(users.id, userId))
    .limit(1);
  if (!row) throw notFound('User');
  const { user, lab } = row;
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    labId: user.labId,
    lab: lab ?? null,
  };
}
