import { createHash, randomBytes, randomUUID } from 'node:crypto';
import { recordAudit, type Database } from '@plumbline/db';
import {
  invitationAcceptSchema,
  invitationCreateSchema,
  labCreateSchema,
  labDeactivateSchema,
  labUpdateSchema,
  labUserUpdateSchema,
  networkProceduresQuerySchema,
  type InvitationCreated,
  type InvitationInfo,
  type LabDetail,
  type LabUser,
  type NetworkProceduresPage,
} from '@plumbline/contracts';
import { actorOf, type Principal } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { hashPassword } from '../../auth/passwords.ts';
import { assertPasswordAllowed } from '../../auth/password-policy.ts';
import { AppError, conflict, notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import { changesBetween, writeOrConflict } from '../catalogue-admin/catalogue-admin.service.ts';
import {
  findInvitationByHash,
  findLab,
  findLabUser,
  findUserByEmail,
  insertInvitation,
  insertLab,
  insertUser,
  listLabUsers,
  listNetworkProcedures,
  markInvitationAccepted,
  revokeOpenInvitations,
  updateLab,
  updateUser,
  type LabRow,
  type UserRow,
} from './network-labs.repository.ts';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** How long an invitation link stays usable: a week (common practice, no standard behind it). */
export const INVITATION_TTL_MS = 7 * 24 * 3600 * 1000;

/** An invitation that exists but can no longer be used answers 410 Gone. */
class GoneError extends AppError {
  constructor(message: string) {
    super('gone', message);
  }
}

const hashInvitationToken = (token: string) => createHash('sha256').update(token).digest('hex');

function labDetail(lab: LabRow): LabDetail {
  return {
    id: lab.id,
    code: lab.code,
    name: lab.name,
    active: lab.active,
    preferredUnits: lab.preferredUnits === 'conventional' ? 'conventional' : 'si',
    createdAt: lab.createdAt.toISOString(),
  };
}

async function loadLab(db: Database, labId: string): Promise<LabRow> {
  const lab = UUID.test(labId) ? await findLab(db, labId) : null;
  if (!lab) throw notFound('Lab');
  return lab;
}

const duplicateLabCode = (code: string) =>
  `A lab with the code "${code}" already exists; lab codes must be unique.`;

// ---------- labs (coordinator) ----------

export async function enrolLab(db: Database, principal: Principal, body: unknown): Promise<LabDetail> {
  const { reason, ...input } = parseInput(labCreateSchema, body);
  const lab = await writeOrConflict(db, duplicateLabCode(input.code), async (tx) => {
    const created = await insertLab(tx, input);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'lab.enrol',
      labId: created.id,
      entity: 'lab',
      entityId: created.id,
      details: { code: created.code, name: created.name, reason: reason ?? null },
    });
    return created;
  });
  return labDetail(lab);
}

export async function editLab(
  db: Database,
  principal: Principal,
  labId: string,
  body: unknown,
): Promise<LabDetail> {
  const { reason, ...input } = parseInput(labUpdateSchema, body);
  const lab = await loadLab(db, labId);
  const given = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
  const changes = changesBetween(lab, given);
  if (Object.keys(changes).length === 0) return labDetail(lab);
  const updated = await writeOrConflict(db, duplicateLabCode(String(input.code)), async (tx) => {
    const row = await updateLab(tx, lab.id, given);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'lab.update',
      labId: lab.id,
      entity: 'lab',
      entityId: lab.id,
      details: { changes, reason: reason ?? null },
    });
    return row;
  });
  return labDetail(updated);
}

export async function deactivateLab(
  db: Database,
  principal: Principal,
  labId: string,
  body: unknown,
): Promise<LabDetail> {
  const { reason } = parseInput(labDeactivateSchema, body ?? {});
  const lab = await loadLab(db, labId);
  if (!lab.active) throw conflict(`The lab "${lab.code}" is already deactivated.`);
  const updated = await db.transaction(async (tx) => {
    const row = await updateLab(tx, lab.id, { active: false });
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'lab.deactivate',
      labId: lab.id,
      entity: 'lab',
      entityId: lab.id,
      details: { reason: reason ?? null },
    });
    return row;
  });
  return labDetail(updated);
}

// ---------- lab users (coordinator: any lab; supervisor: own lab) ----------

function labUser(user: UserRow, invitationPending: boolean): LabUser {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role === 'supervisor' ? 'supervisor' : 'analyst',
    active: user.active,
    invitationPending,
    createdAt: user.createdAt.toISOString(),
  };
}

export async function usersOfLab(db: Database, principal: Principal, labId: string): Promise<LabUser[]> {
  assertLabAccess(principal, labId);
  const lab = await loadLab(db, labId);
  const rows = await listLabUsers(db, lab.id);
  return rows.map(({ user, invitationPending }) => labUser(user, invitationPending));
}

export async function inviteUser(
  db: Database,
  principal: Principal,
  labId: string,
  body: unknown,
  publicUrl: string,
): Promise<InvitationCreated> {
  assertLabAccess(principal, labId);
  const input = parseInput(invitationCreateSchema, body);
  const lab = await loadLab(db, labId);
  if (!lab.active)
    throw conflict(`The lab "${lab.code}" is deactivated; reactivate it before inviting users.`);
  const existing = await findUserByEmail(db, input.email);
  const token = randomBytes(32).toString('base64url');
  const expiresAt = new Date(Date.now() + INVITATION_TTL_MS);
  // An address already used outside this lab must not be revealed to the inviter: the answer looks
  // like any other invitation, and the coordinator finds the conflict in the audit log.
  if (existing && existing.labId !== lab.id) {
    return hiddenConflictInvitation(db, principal, lab.id, existing.id, input, token, expiresAt, publicUrl);
  }
  // Inviting again someone who never accepted replaces the old invitation; anyone else is a conflict.
  const reinvite = existing && !existing.active && existing.passwordHash === null;
  if (existing && !reinvite) {
    throw conflict(`A user with the e-mail address ${input.email} already exists.`, [
      { path: 'email', message: 'this e-mail address is already in use' },
    ]);
  }
  const { user, invitation } = await writeOrConflict(
    db,
    `A user with the e-mail address ${input.email} already exists.`,
    async (tx) => {
      const invited = existing
        ? await updateUser(tx, existing.id, { name: input.name, role: input.role })
        : await insertUser(tx, {
            email: input.email,
            name: input.name,
            role: input.role,
            labId: lab.id,
            active: false,
          });
      if (existing) await revokeOpenInvitations(tx, existing.id);
      const created = await insertInvitation(tx, {
        userId: invited.id,
        labId: lab.id,
        tokenHash: hashInvitationToken(token),
        createdBy: principal.kind === 'user' ? principal.userId : null,
        expiresAt,
      });
      await recordAudit(tx, {
        ...actorOf(principal),
        kind: 'lab-user.invite',
        labId: lab.id,
        entity: 'user',
        entityId: invited.id,
        details: { email: invited.email, role: invited.role, reinvite: Boolean(existing) },
      });
      return { user: invited, invitation: created };
    },
  );
  return {
    invitationId: invitation.id,
    user: { id: user.id, email: user.email, name: user.name, role: input.role, labId: lab.id },
    expiresAt: expiresAt.toISOString(),
    link: `${publicUrl.replace(/\/+$/, '')}/invitations/${token}`,
  };
}

/** Records the conflict for the coordinator and answers as if an invitation had been made (its link leads nowhere). */
async function hiddenConflictInvitation(
  db: Database,
  principal: Principal,
  labId: string,
  existingUserId: string,
  input: { email: string; name: string; role: 'analyst' | 'supervisor' },
  token: string,
  expiresAt: Date,
  publicUrl: string,
): Promise<InvitationCreated> {
  await recordAudit(db, {
    ...actorOf(principal),
    kind: 'lab-user.invite-conflict',
    labId,
    entity: 'user',
    entityId: existingUserId,
    details: { email: input.email, role: input.role, reason: 'address already used in another lab' },
  });
  return {
    invitationId: randomUUID(),
    user: { id: randomUUID(), email: input.email, name: input.name, role: input.role, labId },
    expiresAt: expiresAt.toISOString(),
    link: `${publicUrl.replace(/\/+$/, '')}/invitations/${token}`,
  };
}

export async function updateLabUser(
  db: Database,
  principal: Principal,
  labId: string,
  userId: string,
  body: unknown,
): Promise<LabUser> {
  assertLabAccess(principal, labId);
  const { reason, ...input } = parseInput(labUserUpdateSchema, body);
  const lab = await loadLab(db, labId);
  const user = UUID.test(userId) ? await findLabUser(db, lab.id, userId) : null;
  if (!user) throw notFound('User');
  if (principal.kind === 'user' && principal.userId === user.id) {
    throw conflict(
      'You cannot change your own role or deactivate yourself; ask another supervisor or the coordinator.',
    );
  }
  const pending = user.passwordHash === null;
  if (input.active === true && pending) {
    throw conflict(
      `${user.email} has not accepted the invitation yet; the account becomes active when they do.`,
    );
  }
  const given = Object.fromEntries(Object.entries(input).filter(([, v]) => v !== undefined));
  const changes = changesBetween(user, given);
  // Deactivating someone who never accepted also withdraws the invitation.
  const withdrawInvitation = input.active === false && pending;
  if (Object.keys(changes).length === 0 && !withdrawInvitation) {
    return labUser(user, pending && !user.active);
  }
  const updated = await db.transaction(async (tx) => {
    const row = Object.keys(changes).length ? await updateUser(tx, user.id, given) : user;
    if (withdrawInvitation) await revokeOpenInvitations(tx, user.id);
    await recordAudit(tx, {
      ...actorOf(principal),
      kind: 'lab-user.update',
      labId: lab.id,
      entity: 'user',
      entityId: user.id,
      details: {
        email: user.email,
        changes,
        invitationWithdrawn: withdrawInvitation,
        reason: reason ?? null,
      },
    });
    return row;
  });
  return labUser(updated, updated.passwordHash === null && !withdrawInvitation);
}

// ---------- invitations (public, by token) ----------

async function usableInvitation(
  db: Parameters<typeof findInvitationByHash>[0],
  token: string,
  lock: boolean,
) {
  const found = await findInvitationByHash(db, hashInvitationToken(token), lock);
  if (!found || found.invitation.revokedAt) throw notFound('Invitation');
  if (found.invitation.acceptedAt)
    throw new GoneError('This invitation has already been used. Sign in instead.');
  if (found.invitation.expiresAt.getTime() <= Date.now()) {
    throw new GoneError(
      'This invitation has expired. Ask your supervisor or the network coordinator for a new one.',
    );
  }
  if (!found.lab.active) throw new GoneError('This lab is no longer active in the network.');
  return found;
}

export async function describeInvitation(db: Database, token: string): Promise<InvitationInfo> {
  const { invitation, user, lab } = await usableInvitation(db, token, false);
  return {
    email: user.email,
    name: user.name,
    labName: lab.name,
    expiresAt: invitation.expiresAt.toISOString(),
  };
}

export async function acceptInvitation(db: Database, body: unknown): Promise<{ email: string }> {
  const input = parseInput(invitationAcceptSchema, body);
  assertPasswordAllowed(input.password);
  const passwordHash = await hashPassword(input.password);
  return db.transaction(async (tx) => {
    const { invitation, user } = await usableInvitation(tx, input.token, true);
    await updateUser(tx, user.id, { passwordHash, active: true });
    await markInvitationAccepted(tx, invitation.id);
    await recordAudit(tx, {
      actorId: user.id,
      kind: 'lab-user.accept-invitation',
      labId: invitation.labId,
      entity: 'user',
      entityId: user.id,
    });
    return { email: user.email };
  });
}

// ---------- procedures across the network ----------

export async function networkProcedures(db: Database, rawQuery: unknown): Promise<NetworkProceduresPage> {
  const query = parseInput(networkProceduresQuerySchema, rawQuery, 'query');
  const page = await listNetworkProcedures(db, query);
  return { ...page, minLabs: query.minLabs };
}
