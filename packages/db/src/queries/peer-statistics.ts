import { and, asc, eq, gte, inArray, isNull, lte, sql } from 'drizzle-orm';
import { peerStatistics as computePeerStatistics, pool, type PeerStatistics } from '@plumbline/stats';
import { peerExclusions, peerGroups, peerStatistics, peerStatisticsRequests, type ExcludedLab } from '../schema/peer-groups.ts';
import { procedures } from '../schema/procedures.ts';
import { qcSummaries } from '../schema/qc-data.ts';
import type { Database, Executor } from '../client.ts';
import { PEER_TIERS, loadPeerKeyParts, resolvePeerMembership, type PeerMembership } from './peer-groups.ts';

/** One lot, analyte, level and period whose peer statistics must be (re)computed. */
export type PeerStatisticsTarget = { controlLotId: string; analyteId: string; level: number; period: string };

export type PeerStatisticsSettings = {
  /** Labs that must remain for figures to be published (METHODS.md §2: 3, a setting). */
  minLabs?: number;
};

/** Only one recompute runs at a time across every worker: an advisory lock held for its transaction. */
const RECOMPUTE_LOCK_KEY = 740_100_001;

/** Adds targets to the recompute list; call it in the transaction that changes the QC data. */
export async function requestPeerStatistics(db: Executor, targets: readonly PeerStatisticsTarget[]): Promise<void> {
  const unique = dedupeTargets(targets);
  for (let i = 0; i < unique.length; i += 1000) {
    await db
      .insert(peerStatisticsRequests)
      .values(unique.slice(i, i + 1000).map((t) => ({ ...t, requestedAt: sql`clock_timestamp()` })))
      .onConflictDoUpdate({
        target: [
          peerStatisticsRequests.controlLotId,
          peerStatisticsRequests.analyteId,
          peerStatisticsRequests.level,
          peerStatisticsRequests.period,
        ],
        set: { requestedAt: sql`clock_timestamp()` },
      });
  }
}

/**
 * Recomputes every requested target and removes the requests it served, waiting for a recompute that is
 * already running elsewhere to finish first. A request renewed while the recompute ran (new data
 * committed meanwhile) keeps its place for the next drain. Returns the number of targets recomputed.
 */
export async function drainPeerStatisticsRequests(db: Database, settings: PeerStatisticsSettings = {}): Promise<number> {
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
    const lock = await tx.execute<{ locked: boolean }>(sql`select pg_try_advisory_xact_lock(${RECOMPUTE_LOCK_KEY}) as locked`);
    if (!lock.rows[0]?.locked) return null;
    return drainClaimed(tx, settings);
  });
}

/**
 * Drains until nothing is waiting, without ever waiting for another drainer: whoever holds the lock
 * checks again after releasing it, so a request committed before this call is always served by someone.
 */
export async function drainPeerStatisticsUntilIdle(db: Database, settings: PeerStatisticsSettings = {}): Promise<void> {
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
  }>(sql`select control_lot_id, analyte_id, level, period, requested_at::text as stamp from peer_statistics_requests`);
  if (claimed.rows.length === 0) return 0;
  await recomputePeerStatistics(
    tx,
    claimed.rows.map((r) => ({ controlLotId: r.control_lot_id, analyteId: r.analyte_id, level: r.level, period: r.period })),
    settings,
  );
  for (const r of claimed.rows) {
    await tx.execute(sql`
      delete from peer_statistics_requests
      where control_lot_id = ${r.control_lot_id} and analyte_id = ${r.analyte_id}
        and level = ${r.level} and period = ${r.period} and requested_at = ${r.stamp}::timestamptz`);
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
export async function recomputeAllPeerStatistics(db: Database, settings: PeerStatisticsSettings = {}): Promise<number> {
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
    await recomputePeerStatistics(tx, targets, settings);
    await tx.delete(peerStatisticsRequests);
    return targets.length;
  });
}

type SummaryRow = {
  procedureId: string;
  level: number;
  period: string;
  n: number;
  mean: number;
  sd: number;
};

type ExclusionRow = { procedureId: string; level: number | null; period: string; reason: string };

/**
 * Recomputes provisional (version 0) peer statistics for the targets: for each peer group of the lot and
 * analyte, the period figures of each target level and period, and the lot-to-date cumulative figures of
 * that period and every later one (they all include it). The caller holds the recompute lock.
 *
 * Each member procedure counts as one lab series in `peerStatistics` (a lab running the same control on
 * two analysers of a group contributes two series). Coordinator exclusions for the period are passed as
 * manual exclusions; cumulative figures leave the excluded months out of that lab's to-date pool.
 */
export async function recomputePeerStatistics(
  tx: Executor,
  targets: readonly PeerStatisticsTarget[],
  settings: PeerStatisticsSettings = {},
): Promise<void> {
  const byLotAnalyte = new Map<string, PeerStatisticsTarget[]>();
  for (const t of dedupeTargets(targets)) {
    const key = `${t.controlLotId}|${t.analyteId}`;
    const list = byLotAnalyte.get(key);
    if (list) list.push(t);
    else byLotAnalyte.set(key, [t]);
  }
  for (const group of byLotAnalyte.values()) {
    await recomputeLotAnalyte(tx, group[0].controlLotId, group[0].analyteId, group, settings);
  }
}

async function recomputeLotAnalyte(
  tx: Executor,
  controlLotId: string,
  analyteId: string,
  targets: readonly PeerStatisticsTarget[],
  settings: PeerStatisticsSettings,
): Promise<void> {
  const levels = [...new Set(targets.map((t) => t.level))];
  const summaries: SummaryRow[] = await tx
    .select({
      procedureId: qcSummaries.procedureId,
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
        eq(procedures.analyteId, analyteId),
        inArray(qcSummaries.level, levels),
      ),
    )
    .orderBy(asc(qcSummaries.period));

  const procedureIds = [...new Set(summaries.map((s) => s.procedureId))];
  const parts = await loadPeerKeyParts(tx, procedureIds);
  const membership = await resolvePeerMembership(tx, controlLotId, analyteId, parts, { create: true });
  const groupIds = (
    await tx
      .select({ id: peerGroups.id })
      .from(peerGroups)
      .where(and(eq(peerGroups.controlLotId, controlLotId), eq(peerGroups.analyteId, analyteId)))
  ).map((g) => g.id);

  const exclusions: ExclusionRow[] = procedureIds.length
    ? await tx
        .select({
          procedureId: peerExclusions.procedureId,
          level: peerExclusions.level,
          period: peerExclusions.period,
          reason: peerExclusions.reason,
        })
        .from(peerExclusions)
        .where(and(eq(peerExclusions.controlLotId, controlLotId), isNull(peerExclusions.revokedAt)))
    : [];
  const exclusionOf = (procedureId: string, level: number, period: string) =>
    exclusions.find((e) => e.procedureId === procedureId && e.period === period && (e.level === null || e.level === level));

  const rows: (typeof peerStatistics.$inferInsert)[] = [];

  // Period figures of each target.
  for (const target of targets) {
    const entries = summaries.filter((s) => s.level === target.level && s.period === target.period);
    rows.push(
      ...groupFigures(membership, entries, settings, (procedureId) => exclusionOf(procedureId, target.level, target.period)).map(
        (g) => ({ ...g, level: target.level, period: target.period, scope: 'period', version: 0 }),
      ),
    );
  }

  // Lot-to-date figures from the earliest target period on, per level.
  const firstPeriodByLevel = new Map<number, string>();
  for (const t of targets) {
    const earlier = firstPeriodByLevel.get(t.level);
    if (!earlier || t.period < earlier) firstPeriodByLevel.set(t.level, t.period);
  }
  for (const [level, firstPeriod] of firstPeriodByLevel) {
    const ofLevel = summaries.filter((s) => s.level === level);
    const periods = [...new Set(ofLevel.map((s) => s.period))].filter((p) => p >= firstPeriod).sort();
    for (const period of periods) {
      const toDate = cumulativeByProcedure(
        ofLevel.filter((s) => s.period <= period && !exclusionOf(s.procedureId, level, s.period)),
      );
      rows.push(
        ...groupFigures(membership, toDate, settings, () => undefined).map((g) => ({
          ...g,
          level,
          period,
          scope: 'cumulative',
          version: 0,
        })),
      );
    }
  }

  // Replace the provisional figures of the targets (and of the to-date periods) with the new ones.
  if (groupIds.length) {
    for (const target of targets) {
      await tx
        .delete(peerStatistics)
        .where(
          and(
            inArray(peerStatistics.peerGroupId, groupIds),
            eq(peerStatistics.version, 0),
            eq(peerStatistics.scope, 'period'),
            eq(peerStatistics.level, target.level),
            eq(peerStatistics.period, target.period),
          ),
        );
    }
    for (const [level, firstPeriod] of firstPeriodByLevel) {
      await tx
        .delete(peerStatistics)
        .where(
          and(
            inArray(peerStatistics.peerGroupId, groupIds),
            eq(peerStatistics.version, 0),
            eq(peerStatistics.scope, 'cumulative'),
            eq(peerStatistics.level, level),
            gte(peerStatistics.period, firstPeriod),
          ),
        );
    }
  }
  for (let i = 0; i < rows.length; i += 500) {
    await tx.insert(peerStatistics).values(rows.slice(i, i + 500));
  }
}

/** Each procedure's to-date figures: its monthly summaries pooled (METHODS.md §1). */
function cumulativeByProcedure(rows: readonly SummaryRow[]): SummaryRow[] {
  const byProcedure = new Map<string, SummaryRow[]>();
  for (const r of rows) {
    const list = byProcedure.get(r.procedureId);
    if (list) list.push(r);
    else byProcedure.set(r.procedureId, [r]);
  }
  const result: SummaryRow[] = [];
  for (const [procedureId, parts] of byProcedure) {
    const pooled = parts.length === 1 ? parts[0] : pool(parts);
    result.push({ procedureId, level: parts[0].level, period: parts[parts.length - 1].period, n: pooled.n, mean: pooled.mean, sd: pooled.sd });
  }
  return result;
}

type GroupFigures = Omit<typeof peerStatistics.$inferInsert, 'level' | 'period' | 'scope' | 'version'>;

/** peerStatistics for every group that has members among the entries, at every tier. */
function groupFigures(
  membership: PeerMembership,
  entries: readonly SummaryRow[],
  settings: PeerStatisticsSettings,
  exclusionOf: (procedureId: string) => ExclusionRow | undefined,
): GroupFigures[] {
  const members = new Map<string, SummaryRow[]>();
  for (const entry of entries) {
    const groups = membership.get(entry.procedureId);
    if (!groups) continue;
    for (const tier of PEER_TIERS) {
      const group = groups[tier];
      if (!group) continue;
      const list = members.get(group.id);
      if (list) list.push(entry);
      else members.set(group.id, [entry]);
    }
  }
  const result: GroupFigures[] = [];
  for (const [peerGroupId, list] of members) {
    const manual = list.filter((e) => exclusionOf(e.procedureId));
    const stats: PeerStatistics = computePeerStatistics(
      list.map((e) => ({ id: e.procedureId, n: e.n, mean: e.mean, sd: e.sd })),
      { minLabs: settings.minLabs, excludeIds: manual.map((e) => e.procedureId) },
    );
    const excluded: ExcludedLab[] = stats.excluded.map((x) => {
      const note = x.reason === 'manual' ? exclusionOf(x.id)?.reason : undefined;
      return note ? { id: x.id, reason: x.reason, note } : { id: x.id, reason: x.reason };
    });
    result.push({
      peerGroupId,
      labs: stats.labs,
      n: stats.n,
      mean: finiteOrNull(stats.mean),
      sd: finiteOrNull(stats.sd),
      cv: finiteOrNull(stats.cv),
      withinSd: finiteOrNull(stats.withinSd),
      withinCv: finiteOrNull(stats.withinCv),
      robustMean: finiteOrNull(stats.robustMean),
      robustSd: finiteOrNull(stats.robustSd),
      sufficient: stats.sufficient,
      excluded,
      members: list.map((e) => e.procedureId),
    });
  }
  return result;
}

const finiteOrNull = (x: number): number | null => (Number.isFinite(x) ? x : null);

function dedupeTargets(targets: readonly PeerStatisticsTarget[]): PeerStatisticsTarget[] {
  const seen = new Map<string, PeerStatisticsTarget>();
  for (const t of targets) seen.set(`${t.controlLotId}|${t.analyteId}|${t.level}|${t.period}`, t);
  return [...seen.values()];
}
