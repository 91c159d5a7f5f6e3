import { eq } from 'drizzle-orm';
import { labs, recordAudit, type Database } from '@plumbline/db';
import type { LabApiToken, LabApiTokenCreated } from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { assertLabAccess } from '../../auth/authenticate.ts';
import { newLabToken } from '../../auth/lab-tokens.ts';
import { conflict, notFound } from '../../errors/app-error.ts';
import * as repo from './lab-tokens.repository.ts';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

function toToken(row: repo.LabTokenRow): LabApiToken {
  return {
    id: row.id,
    labId: row.labId,
    name: row.name,
    prefix: row.prefix,
    createdAt: row.createdAt.toISOString(),
    lastUsedAt: row.lastUsedAt?.toISOString() ?? null,
    revokedAt: row.revokedAt?.toISOString() ?? null,
  };
}

async function existingLab(db: Database, principal: Principal, labId: string) {
  assertLabAccess(principal, labId);
  const [lab] = UUID.test(labId)
    ? await db.select({ id: labs.id }).from(labs).where(eq(labs.id, labId)).limit(1)
    : [];
  if (!lab) throw notFound('Lab');
}

export async function listLabTokens(
  db: Database,
  principal: Principal,
  labId: string,
): Promise<LabApiToken[]> {
  await existingLab(db, principal, labId);
  return (await repo.listTokens(db, labId)).map(toToken);
}

/** Creates a token; the secret is in this response only (a SHA-256 of it is stored). */
export async function createLabToken(
  db: Database,
  principal: Principal,
  labId: string,
  input: { name: string },
): Promise<LabApiTokenCreated> {
  await existingLab(db, principal, labId);
  const { token, prefix, tokenHash } = newLabToken();
  const row = await db.transaction(async (tx) => {
    const created = await repo.insertToken(tx, {
      labId,
      name: input.name,
      prefix,
      tokenHash,
      createdBy: principal.kind === 'user' ? principal.userId : null,
    });
    await recordAudit(tx, {
      kind: 'lab-token.created',
      ...actorOf(principal),
      labId,
      entity: 'lab-api-token',
      entityId: created.id,
      details: { name: input.name, prefix },
    });
    return created;
  });
  return { ...toToken(row), token };
}

export async function revokeLabToken(
  db: Database,
  principal: Principal,
  labId: string,
  tokenId: string,
): Promise<void> {
  await existingLab(db, principal, labId);
  const row = UUID.test(tokenId) ? await repo.findToken(db, labId, tokenId) : null;
  if (!row) throw notFound('API token');
  await db.transaction(async (tx) => {
    const revoked = await repo.revokeToken(tx, tokenId);
    if (!revoked) throw conflict('This API token has already been revoked.');
    await recordAudit(tx, {
      kind: 'lab-token.revoked',
      ...actorOf(principal),
      labId,
      entity: 'lab-api-token',
      entityId: tokenId,
      details: { name: row.name, prefix: row.prefix },
    });
  });
}
