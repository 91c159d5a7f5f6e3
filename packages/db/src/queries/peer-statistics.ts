import { and, asc, eq, gte, inArray, isNull, lte, or, sql } from 'drizzle-orm';
import {
  peerExclusions,
  peerGroups,
  peerStatistics,
  peerStatisticsFailures,
  peerStatisticsRequests,
} from '../schema/peer-groups.ts';
import { procedures } from '../schema/procedures.ts';
import { qcSummaries } from '../schema/qc-data.ts';
import type { Database, Executor } from '../client.ts';
import { loadPeerKeyParts, resolvePeerMembership } from './peer-groups.ts';
import {
  cumulativeByProcedure,
  groupFigures,
  type ExclusionRow,
  type PeerStatisticsSettings,
  type SummaryRow,
} from './peer-group-figures.ts';

export type { ComputeGroupStatistics, PeerStatisticsSettings } from './peer-group-figures.ts';

/** One lot, analyte, level and period whose peer statistics must be (re)computed. */
export type PeerStatisticsTarget = { controlLotId: string; analyteId: string; level: number; period: string };

/** Only one recompute runs at a time across every worker: an advisory lock held for its transaction. */
const RECOMPUTE_LOCK_KEY = 740_100_001;

/**
 * Adds targets to the recompute list; call it in the transaction that changes the QC data. The request
 * rows are shared by every lab of a peer group: they are locked in key order, so two transactions
 * adding overlapping targets wait for each other instead of deadlocking. (One statement with the
 * targets as array parameters: it runs for every stored upload.)
 */
export async function requestPeerStatistics(
  db: Executor,
  targets: readonly PeerStatisticsTarget[],
): Promise<void> {
  const unique = dedupeTargets(targets).sort(compareTargets);
  for (let i = 0; i < unique.length; i += 1000) {
    const batch = unique.slice(i, i + 1000);
    await db.execute(sql`
      insert into peer_statistics_requests (control_lot_id, analyte_id, level, period, requested_at)
      select t.control_lot_id, t.analyte_id, t.level, t.period, clock_timestamp()
        from unnest(${sql.param(batch.map((t) => t.controlLotId))}::uuid[],
                    ${sql.param(batch.map((t) => t.analyteId))}::uuid[],
                    ${sql.param(batch.map((t) => t.level))}::int[],
                    ${sql.param(batch.map((t) => t.period))}::text[])
          as t(control_lot_id, analyte_id, level, period)
      on conflict (control_lot_id, analyte_id, level, period) do update set requested_at = clock_timestamp()`);
  }
}

const compareTargets = (a: PeerStatisticsTarget, b: PeerStatisticsTarget) =>
  a.controlLotId < b.controlLotId
    ? -1
    : a.controlLotId > b.controlLotId
      ? 1
      : a.analyteId < b.analyteId
        ? -1
        : a.analyteId > b.analyteId
          ? 1
          : a.level - b.level || (a.period < b.period ? -1 : a.period > b.period ? 1 : 0);

/**
 * Recomputes every requested target and removes the requests it served, waiting for a recompute that is
 * already running elsewhere to finish first. A request renewed while the recompute ran (new data
 * committed meanwhile) keeps its place for the next drain. Returns the number of targets recomputed.
 */
export async function drainPeerStatisticsRequests(
  db: Database,
  settings: PeerStatisticsSettings = {},
): Promise<number> {
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${RECOMPUTE_LOCK_KEY})`);
    return drainClaimed(tx, settings);
  });
}

/**
 * Like drainPeerStatisticsRequests, but returns null at once when another recompute holds the lock
 * (that one sees the requests committed before it looks, and its caller looks again after it ends).
 */
export async function drainPeerStatisticsRequestsIfFree(
  db: Database,
  settings: PeerStatisticsSettings = {},
): Promise<number | null> {
  return db.transaction(async (tx) => {
    const lock = await tx.execute<{ locked: boolean }>(
      sql`select pg_try_advisory_xact_lock(${RECOMPUTE_LOCK_KEY}) as locked`,
    );
    if (!lock.rows[0]?.locked) return null;
    return drainClaimed(tx, settings);
  });
}

/**
 * Drains until nothing is waiting, without ever waiting for another drainer: whoever holds the lock
 * checks again after releasing it, so a request committed before this call is always served by someone.
 */
export async function drainPeerStatisticsUntilIdle(
  db: Database,
  settings: PeerStatisticsSettings = {},
): Promise<void> {
  while (true) {
    const drained = await drainPeerStatisticsRequestsIfFree(db, settings);
    if (drained === null) return;
    if (!(await hasPendingPeerStatistics(db))) return;
  }
}

async function drainClaimed(tx: Executor, settings: PeerStatisticsSettings): Promise<number> {
  const claimed = await tx.execute<{
    control_lot_id: string;
    analyte_id: string;
    level: number;
    period: string;
    stamp: string;
  }>(
    sql`select control_lot_id, analyte_id, level, period, requested_at::text as stamp from peer_statistics_requests`,
  );
  if (claimed.rows.length === 0) return 0;
  await recomputePeerStatistics(
    tx,
    claimed.rows.map((r) => ({
      controlLotId: r.control_lot_id,
      analyteId: r.analyte_id,
      level: r.level,
      period: r.period,
    })),
    settings,
  );
  for (let i = 0; i < claimed.rows.length; i += 500) {
    const batch = claimed.rows.slice(i, i + 500);
    await tx.execute(sql`
      delete from peer_statistics_requests
      where (control_lot_id, analyte_id, level, period, requested_at) in (${sql.join(
        batch.map(
          (r) =>
            sql`(${r.control_lot_id}::uuid, ${r.analyte_id}::uuid, ${r.level}::int, ${r.period}::text, ${r.stamp}::timestamptz)`,
        ),
        sql`, `,
      )})`);
  }
  return claimed.rows.length;
}

/** True while recompute requests are waiting; with a period, only those that change its figures (that period or an earlier one, through the lot-to-date figures). */
export async function hasPendingPeerStatistics(db: Executor, period?: string): Promise<boolean> {
  const rows = await db
    .select({ level: peerStatisticsRequests.level })
    .from(peerStatisticsRequests)
    .where(period ? lte(peerStatisticsRequests.period, period) : undefined)
    .limit(1);
  return rows.length > 0;
}

/**
 * Recomputes the provisional (version 0) peer statistics of every lot, analyte, level and period that has
 * QC summaries, replacing whatever provisional figures were there. The demo seed and start script call it.
 */
export async function recomputeAllPeerStatistics(
  db: Database,
  settings: PeerStatisticsSettings = {},
): Promise<number> {
  return db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${RECOMPUTE_LOCK_KEY})`);
    const targets = await tx
      .selectDistinct({
        controlLotId: qcSummaries.controlLotId,
        analyteId: procedures.analyteId,
        level: qcSummaries.level,
        period: qcSummaries.period,
      })
      .from(qcSummaries)
      .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId));
    await tx.delete(peerStatistics).where(eq(peerStatistics.version, 0));
    // A full recompute records its own failures; older ones may concern data that is gone.
    await tx.delete(peerStatisticsFailures);
    await recomputePeerStatistics(tx, targets, settings);
    await tx.delete(peerStatisticsRequests);
    return targets.length;
  });
}

/**
 * Recomputes provisional (version 0) peer statistics for the targets: for each peer group of the lot and
 * analyte, the period figures of each target level and period, and the lot-to-date cumulative figures of
 * that period and every later one (they all include it). The caller holds the recompute lock.
 *
 * Each member procedure counts as one lab series in `peerStatistics` (a lab running the same control on
 * two analysers of a group contributes two series). Coordinator exclusions for the period are passed as
 * manual exclusions; cumulative figures leave the excluded months out of that lab's to-date pool.
 * Work is done per control lot, a fixed handful of queries however many analytes and labs it covers.
 */
export async function recomputePeerStatistics(
  tx: Executor,
  targets: readonly PeerStatisticsTarget[],
  settings: PeerStatisticsSettings = {},
): Promise<void> {
  const byLot = new Map<string, PeerStatisticsTarget[]>();
  for (const t of dedupeTargets(targets)) {
    const list = byLot.get(t.controlLotId);
    if (list) list.push(t);
    else byLot.set(t.controlLotId, [t]);
  }
  for (const [controlLotId, lotTargets] of byLot) await recomputeLot(tx, controlLotId, lotTargets, settings);
}

async function recomputeLot(
  tx: Executor,
  controlLotId: string,
  targets: readonly PeerStatisticsTarget[],
  settings: PeerStatisticsSettings,
): Promise<void> {
  const analyteIds = [...new Set(targets.map((t) => t.analyteId))];
  const levels = [...new Set(targets.map((t) => t.level))];
  const summaries: SummaryRow[] = await tx
    .select({
      procedureId: qcSummaries.procedureId,
      analyteId: procedures.analyteId,
      level: qcSummaries.level,
      period: qcSummaries.period,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .where(
      and(
        eq(qcSummaries.controlLotId, controlLotId),
        inArray(procedures.analyteId, analyteIds),
        inArray(qcSummaries.level, levels),
      ),
    )
    .orderBy(asc(qcSummaries.period));

  // Summaries by analyte and level, in period order.
  const series = new Map<string, SummaryRow[]>();
  for (const s of summaries) {
    const key = `${s.analyteId}|${s.level}`;
    const list = series.get(key);
    if (list) list.push(s);
    else series.set(key, [s]);
  }

  const parts = await loadPeerKeyParts(tx, [...new Set(summaries.map((s) => s.procedureId))]);
  const membership = await resolvePeerMembership(tx, controlLotId, parts, { create: true });
  const groups = await tx
    .select({ id: peerGroups.id, analyteId: peerGroups.analyteId })
    .from(peerGroups)
    .where(and(eq(peerGroups.controlLotId, controlLotId), inArray(peerGroups.analyteId, analyteIds)));
  const groupIdsOf = (analyteId: string) => groups.filter((g) => g.analyteId === analyteId).map((g) => g.id);

  const exclusions: ExclusionRow[] = await tx
    .select({
      procedureId: peerExclusions.procedureId,
      level: peerExclusions.level,
      period: peerExclusions.period,
      reason: peerExclusions.reason,
    })
    .from(peerExclusions)
    .where(and(eq(peerExclusions.controlLotId, controlLotId), isNull(peerExclusions.revokedAt)));
  const exclusionOf = (procedureId: string, level: number, period: string) =>
    exclusions.length === 0
      ? undefined
      : exclusions.find(
          (e) =>
            e.procedureId === procedureId && e.period === period && (e.level === null || e.level === level),
        );

  const rows: (typeof peerStatistics.$inferInsert)[] = [];
  const failures: (typeof peerStatisticsFailures.$inferInsert)[] = [];

  // Period figures of each target.
  for (const target of targets) {
    const entries = (series.get(`${target.analyteId}|${target.level}`) ?? []).filter(
      (s) => s.period === target.period,
    );
    const computed = groupFigures(membership, entries, settings, (id) =>
      exclusionOf(id, target.level, target.period),
    );
    const at = { level: target.level, period: target.period, scope: 'period' } as const;
    for (const g of computed.figures) rows.push({ ...g, ...at, version: 0 });
    for (const f of computed.failures) failures.push({ ...f, ...at });
  }

  // Lot-to-date figures from the earliest target period on, per analyte and level.
  const firstPeriod = new Map<string, PeerStatisticsTarget>();
  for (const t of targets) {
    const key = `${t.analyteId}|${t.level}`;
    const earlier = firstPeriod.get(key);
    if (!earlier || t.period < earlier.period) firstPeriod.set(key, t);
  }
  for (const [key, first] of firstPeriod) {
    const ofSeries = series.get(key) ?? [];
    const periods = [...new Set(ofSeries.map((s) => s.period))].filter((p) => p >= first.period).sort();
    for (const period of periods) {
      const toDate = cumulativeByProcedure(
        ofSeries.filter((s) => s.period <= period && !exclusionOf(s.procedureId, first.level, s.period)),
      );
      const computed = groupFigures(membership, toDate, settings, () => undefined);
      const at = { level: first.level, period, scope: 'cumulative' } as const;
      for (const g of computed.figures) rows.push({ ...g, ...at, version: 0 });
      for (const f of computed.failures) failures.push({ ...f, ...at });
    }
  }

  // Replace the provisional figures of the targets (and of the to-date periods) with the new ones.
  const periodConditions = targets
    .filter((t) => groupIdsOf(t.analyteId).length > 0)
    .map((t) =>
      and(
        inArray(peerStatistics.peerGroupId, groupIdsOf(t.analyteId)),
        eq(peerStatistics.level, t.level),
        eq(peerStatistics.period, t.period),
      ),
    );
  if (periodConditions.length) {
    await tx
      .delete(peerStatistics)
      .where(and(eq(peerStatistics.version, 0), eq(peerStatistics.scope, 'period'), or(...periodConditions)));
  }
  // Failures of the same groups, levels and periods are replaced too: a group computed now is cleared.
  const failureConditions = (scope: 'period' | 'cumulative', list: readonly PeerStatisticsTarget[]) =>
    list
      .filter((t) => groupIdsOf(t.analyteId).length > 0)
      .map((t) =>
        and(
          eq(peerStatisticsFailures.scope, scope),
          inArray(peerStatisticsFailures.peerGroupId, groupIdsOf(t.analyteId)),
          eq(peerStatisticsFailures.level, t.level),
          scope === 'period'
            ? eq(peerStatisticsFailures.period, t.period)
            : gte(peerStatisticsFailures.period, t.period),
        ),
      );
  const clearFailures = [
    ...failureConditions('period', targets),
    ...failureConditions('cumulative', [...firstPeriod.values()]),
  ];
  if (clearFailures.length) await tx.delete(peerStatisticsFailures).where(or(...clearFailures));
  if (failures.length) await tx.insert(peerStatisticsFailures).values(failures);
  const cumulativeConditions = [...firstPeriod.values()]
    .filter((t) => groupIdsOf(t.analyteId).length > 0)
    .map((t) =>
      and(
        inArray(peerStatistics.peerGroupId, groupIdsOf(t.analyteId)),
        eq(peerStatistics.level, t.level),
        gte(peerStatistics.period, t.period),
      ),
    );
  if (cumulativeConditions.length) {
    await tx
      .delete(peerStatistics)
      .where(
        and(
          eq(peerStatistics.version, 0),
          eq(peerStatistics.scope, 'cumulative'),
          or(...cumulativeConditions),
        ),
      );
  }
  // The rows as one JSON parameter: building a multi-row insert with the query builder cost more than
  // the recompute itself once a network has a few hundred labs.
  for (let i = 0; i < rows.length; i += 5000) {
    await tx.execute(sql`
      insert into peer_statistics (peer_group_id, level, period, scope, version, labs, n, mean, sd, cv, within_sd,
                                   within_cv, robust_mean, robust_sd, sufficient, excluded, members)
      select r.peer_group_id, r.level, r.period, r.scope, r.version, r.labs, r.n, r.mean, r.sd, r.cv, r.within_sd,
             r.within_cv, r.robust_mean, r.robust_sd, r.sufficient, r.excluded, r.members
        from jsonb_to_recordset(${JSON.stringify(rows.slice(i, i + 5000).map(statisticsRecord))}::jsonb)
          as r(peer_group_id uuid, level int, period text, scope text, version int, labs int, n int, mean float8,
               sd float8, cv float8, within_sd float8, within_cv float8, robust_mean float8, robust_sd float8,
               sufficient boolean, excluded jsonb, members jsonb)`);
  }
}

/** A peer statistics row under its column names (finite numbers or null, so JSON carries them exactly). */
function statisticsRecord(row: typeof peerStatistics.$inferInsert) {
  return {
    peer_group_id: row.peerGroupId,
    level: row.level,
    period: row.period,
    scope: row.scope,
    version: row.version,
    labs: row.labs,
    n: row.n,
    mean: row.mean,
    sd: row.sd,
    cv: row.cv,
    within_sd: row.withinSd,
    within_cv: row.withinCv,
    robust_mean: row.robustMean,
    robust_sd: row.robustSd,
    sufficient: row.sufficient,
    excluded: row.excluded,
    members: row.members,
  };
}

function dedupeTargets(targets: readonly PeerStatisticsTarget[]): PeerStatisticsTarget[] {
  const seen = new Map<string, PeerStatisticsTarget>();
  for (const t of targets) seen.set(`${t.controlLotId}|${t.analyteId}|${t.level}|${t.period}`, t);
  return [...seen.values()];
}
