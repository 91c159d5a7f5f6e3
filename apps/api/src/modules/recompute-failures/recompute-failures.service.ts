import { peerStatisticsFailuresQuerySchema, type PeerStatisticsFailure } from '@plumbline/contracts';
import type { Database } from '@plumbline/db';
import { parseInput } from '../../http/validate.ts';
import * as repo from './recompute-failures.repository.ts';

/**
 * The peer groups whose provisional figures could not be computed on the last recompute (one row per
 * group, level, period and scope), newest period first. A later recompute that computes a group clears it.
 */
export async function listRecomputeFailures(
  db: Database,
  rawQuery: unknown,
): Promise<PeerStatisticsFailure[]> {
  const query = parseInput(peerStatisticsFailuresQuerySchema, rawQuery, 'query');
  const rows = await repo.failures(db, query.period);
  return rows.map((r) => ({
    peerGroupId: r.peerGroupId,
    tier: r.tier,
    groupLabel: r.groupLabel,
    controlLot: { id: r.controlLotId, lotNumber: r.lotNumber },
    analyte: { id: r.analyteId, code: r.analyteCode, name: r.analyteName },
    level: r.level,
    period: r.period,
    scope: r.scope,
    reason: r.reason,
    failedAt: r.failedAt.toISOString(),
  }));
}
