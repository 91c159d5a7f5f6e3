import { and, asc, desc, eq, isNull } from 'drizzle-orm';
import { analytes, controlLots } from '../schema/catalogue.ts';
import { peerGroups, peerStatisticsFailures } from '../schema/peer-groups.ts';
import type { Executor } from '../client.ts';

export type PeerStatisticsFailure = {
  peerGroupId: string;
  tier: 'instrument' | 'method' | 'analyte';
  groupLabel: string;
  controlLotId: string;
  lotNumber: string;
  analyteId: string;
  analyteCode: string;
  analyteName: string;
  level: number;
  period: string;
  scope: 'period' | 'cumulative';
  reason: string;
  failedAt: Date;
};

/**
 * Peer groups whose provisional figures the last recompute could not compute, newest first; with a
 * period, only that period's. Groups merged into another since are left out (their figures are gone).
 */
export async function listPeerStatisticsFailures(
  db: Executor,
  filter: { period?: string } = {},
): Promise<PeerStatisticsFailure[]> {
  const rows = await db
    .select({
      peerGroupId: peerStatisticsFailures.peerGroupId,
      tier: peerGroups.tier,
      groupLabel: peerGroups.label,
      controlLotId: peerGroups.controlLotId,
      lotNumber: controlLots.lotNumber,
      analyteId: peerGroups.analyteId,
      analyteCode: analytes.code,
      analyteName: analytes.name,
      level: peerStatisticsFailures.level,
      period: peerStatisticsFailures.period,
      scope: peerStatisticsFailures.scope,
      reason: peerStatisticsFailures.reason,
      failedAt: peerStatisticsFailures.failedAt,
    })
    .from(peerStatisticsFailures)
    .innerJoin(peerGroups, eq(peerGroups.id, peerStatisticsFailures.peerGroupId))
    .innerJoin(controlLots, eq(controlLots.id, peerGroups.controlLotId))
    .innerJoin(analytes, eq(analytes.id, peerGroups.analyteId))
    .where(
      and(
        isNull(peerGroups.mergedIntoId),
        filter.period ? eq(peerStatisticsFailures.period, filter.period) : undefined,
      ),
    )
    .orderBy(
      desc(peerStatisticsFailures.period),
      asc(analytes.code),
      asc(controlLots.lotNumber),
      asc(peerStatisticsFailures.level),
      asc(peerGroups.tier),
    );
  return rows.map((r) => ({ ...r, scope: r.scope === 'cumulative' ? 'cumulative' : 'period' }));
}
