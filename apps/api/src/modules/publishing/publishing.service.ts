// Publishing a period: freeze its peer statistics as a numbered version that lab reports then show.
// The snapshot itself is made by publishPeriod (packages/db), which the demo seed uses too.
import { asc, count, eq } from 'drizzle-orm';
import {
  PublishRefusedError,
  peerStatistics,
  periods,
  publishPeriod,
  publications,
  users,
  type Database,
} from '@plumbline/db';
import {
  periodKeySchema,
  publishRequestSchema,
  republishRequestSchema,
  type Publication,
  type PublishResult,
} from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { conflict, notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import { periodDetail } from '../cycles/cycles.service.ts';

async function publicationsOf(db: Database, period: string): Promise<Publication[]> {
  const rows = await db
    .select({ publication: publications, publisher: { id: users.id, name: users.name } })
    .from(publications)
    .leftJoin(users, eq(users.id, publications.publishedBy))
    .where(eq(publications.period, period))
    .orderBy(asc(publications.version));
  const counts = await db
    .select({ version: peerStatistics.version, rows: count() })
    .from(peerStatistics)
    .where(eq(peerStatistics.period, period))
    .groupBy(peerStatistics.version);
  return rows.map(({ publication, publisher }) => ({
    period: publication.period,
    version: publication.version,
    reason: publication.reason,
    publishedAt: publication.publishedAt.toISOString(),
    publishedBy: publisher?.id ? { id: publisher.id, name: publisher.name } : null,
    statistics: counts.find((c) => c.version === publication.version)?.rows ?? 0,
  }));
}

async function periodRow(db: Database, period: string) {
  const [row] = await db.select().from(periods).where(eq(periods.period, period)).limit(1);
  if (!row) throw notFound(`Period ${period}`);
  return row;
}

export async function listPublications(db: Database, rawPeriod: string): Promise<Publication[]> {
  const period = parseInput(periodKeySchema, rawPeriod, 'period');
  await periodRow(db, period);
  return publicationsOf(db, period);
}

async function publish(
  db: Database,
  principal: Principal,
  period: string,
  mode: 'publish' | 'republish',
  reason: string | null,
): Promise<PublishResult> {
  try {
    const publication = await publishPeriod(db, period, {
      actorId: principal.kind === 'user' ? principal.userId : null,
      reason,
      allowedStates: mode === 'publish' ? ['closed'] : ['published'],
    });
    const all = await publicationsOf(db, period);
    return {
      period: periodDetail(await periodRow(db, period)),
      publication: all.find((p) => p.version === publication.version)!,
    };
  } catch (error) {
    if (!(error instanceof PublishRefusedError)) throw error;
    if (error.state === null) throw notFound(`Period ${period}`);
    if (mode === 'publish' && error.state === 'open') {
      throw conflict(
        `The period ${period} is still open: close it before publishing, so late data is marked as such.`,
      );
    }
    if (mode === 'publish') {
      throw conflict(
        `The period ${period} is already published (version ${error.latestVersion}); republish it with a reason.`,
      );
    }
    throw conflict(
      `The period ${period} has not been published yet (it is ${error.state}); publish it first.`,
    );
  }
}

export async function publishFirst(db: Database, principal: Principal, rawPeriod: string, body: unknown) {
  const period = parseInput(periodKeySchema, rawPeriod, 'period');
  const { reason } = parseInput(publishRequestSchema, body ?? {});
  return publish(db, principal, period, 'publish', reason ?? null);
}

export async function republish(db: Database, principal: Principal, rawPeriod: string, body: unknown) {
  const period = parseInput(periodKeySchema, rawPeriod, 'period');
  const { reason } = parseInput(republishRequestSchema, body ?? {});
  return publish(db, principal, period, 'republish', reason);
}
