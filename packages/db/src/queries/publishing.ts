import { and, desc, eq, sql } from 'drizzle-orm';
import { periods, publications } from '../schema/periods.ts';
import type { Database } from '../client.ts';
import { recordAudit } from './audit.ts';
import {
  drainPeerStatisticsRequests,
  hasPendingPeerStatistics,
  type PeerStatisticsSettings,
} from './peer-statistics.ts';

type PeriodState = (typeof periods.$inferSelect)['state'];

/** Publishing was refused because the period is in a state the caller did not allow (or does not exist). */
export class PublishRefusedError extends Error {
  readonly period: string;
  /** Null when the period does not exist. */
  readonly state: PeriodState | null;
  readonly latestVersion: number;

  constructor(period: string, state: PeriodState | null, latestVersion: number) {
    super(
      state === null
        ? `publishPeriod: the period ${period} does not exist`
        : `publishPeriod: the period ${period} is ${state} (latest published version ${latestVersion})`,
    );
    this.name = 'PublishRefusedError';
    this.period = period;
    this.state = state;
    this.latestVersion = latestVersion;
  }
}

export type PublishOptions = {
  actorId?: string | null;
  /** For machine actors (e.g. the demo seed). */
  actorLabel?: string | null;
  reason?: string | null;
  /** States the period may be in; any state when left out. */
  allowedStates?: readonly PeriodState[];
  /** The time recorded for the publication (the demo seed passes its planned dates); now when left out. */
  publishedAt?: Date;
  /** Settings of the recompute run first when requests for the period are pending. */
  statistics?: PeerStatisticsSettings;
};

export type PublicationRecord = typeof publications.$inferSelect & { statistics: number };

/** Serialises publications of one period with each other (the period row is locked as well). */
const PUBLISH_LOCK_KEY = 740_100_003;

/**
 * Publishes a period: freezes its provisional (version 0) peer statistics — the period figures and
 * the lot-to-date figures of that period — as the next version (1 the first time), records the
 * publication, and marks the period published. Earlier versions stay as they were. Recompute
 * requests that change the period's figures are served first, so the snapshot holds every upload
 * stored before the call. Audited as `period.publish` (version 1) or `period.republish`.
 */
export async function publishPeriod(
  db: Database,
  period: string,
  options: PublishOptions = {},
): Promise<PublicationRecord> {
  if (await hasPendingPeerStatistics(db, period)) await drainPeerStatisticsRequests(db, options.statistics);
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${PUBLISH_LOCK_KEY})`);
    const [row] = await tx.select().from(periods).where(eq(periods.period, period)).for('update');
    const [latest] = await tx
      .select({ version: publications.version })
      .from(publications)
      .where(eq(publications.period, period))
      .orderBy(desc(publications.version))
      .limit(1);
    const latestVersion = latest?.version ?? 0;
    if (!row || (options.allowedStates && !options.allowedStates.includes(row.state))) {
      throw new PublishRefusedError(period, row?.state ?? null, latestVersion);
    }
    const version = latestVersion + 1;
    const publishedAt = options.publishedAt ?? new Date();

    // One statement copies the snapshot, so it sees one consistent state of the provisional figures.
    const copied = await tx.execute(sql`
      insert into peer_statistics
        (peer_group_id, level, period, scope, version, labs, n, mean, sd, cv, within_sd, within_cv,
         robust_mean, robust_sd, sufficient, excluded, members, computed_at)
      select peer_group_id, level, period, scope, ${version}, labs, n, mean, sd, cv, within_sd, within_cv,
             robust_mean, robust_sd, sufficient, excluded, members, computed_at
      from peer_statistics
      where period = ${period} and version = 0`);
    // Reports find a procedure's snapshot rows through this narrow table, not the member lists.
    await tx.execute(sql`
      insert into published_statistics_members (procedure_id, peer_statistics_id)
      select distinct m.id::uuid, ps.id
        from peer_statistics ps
       cross join lateral jsonb_array_elements_text(ps.members) as m(id)
       where ps.period = ${period} and ps.version = ${version}`);

    const [publication] = await tx
      .insert(publications)
      .values({
        period,
        version,
        reason: options.reason ?? null,
        publishedBy: options.actorId ?? null,
        publishedAt,
      })
      .returning();
    await tx.update(periods).set({ state: 'published', publishedAt }).where(eq(periods.period, period));
    await recordAudit(tx, {
      kind: version === 1 ? 'period.publish' : 'period.republish',
      actorId: options.actorId ?? null,
      actorLabel: options.actorLabel ?? null,
      entity: 'period',
      entityId: period,
      details: { version, from: row.state, reason: options.reason ?? null, statistics: copied.rowCount ?? 0 },
    });
    return { ...publication, statistics: copied.rowCount ?? 0 };
  });
}

/**
 * Gives every period marked published that has no publication yet its first snapshot (the demo seed
 * marks past months published without writing snapshots). Idempotent: a period with a publication
 * is left alone. Returns the periods published.
 */
export async function publishPeriodsWithoutSnapshot(
  db: Database,
  options: Pick<PublishOptions, 'actorLabel' | 'statistics'> = {},
): Promise<string[]> {
  const rows = await db
    .select({ period: periods.period, publishedAt: periods.publishedAt })
    .from(periods)
    .where(
      and(
        eq(periods.state, 'published'),
        sql`not exists (select 1 from ${publications} where ${publications.period} = ${periods.period})`,
      ),
    )
    .orderBy(periods.period);
  for (const row of rows) {
    await publishPeriod(db, row.period, {
      ...options,
      allowedStates: ['published'],
      publishedAt: row.publishedAt ?? undefined,
    });
  }
  return rows.map((r) => r.period);
}
