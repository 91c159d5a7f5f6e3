import type { Database } from '@plumbline/db';
import type { ParticipationFlag } from '@plumbline/contracts';
import type { Principal } from '../../auth/principal.ts';
import { buildPeerReport } from '../peer-report/peer-report.service.ts';

/** Action-level bounds (docs/methods.md §3; common practice with no single published source). */
const SDI_ACTION = 3;
const CVR_ACTION = 2;

/**
 * Reads every lab's report with the coordinator's rights; the board is coordinator-only, and the
 * report checks nothing but the role for a coordinator.
 */
const boardReader: Principal = {
  kind: 'user',
  userId: 'participation-board',
  role: 'coordinator',
  labId: null,
  jti: 'participation-board',
  expiresAt: new Date(8.64e15),
};

/**
 * Action-level flags per lab for a period — |SDI| > 3, CVR > 2, the lab's data excluded as an
 * outlier from the peer figures, or a row whose comparison cannot be computed — taken from the same report rows the lab itself sees (the published
 * version once the period is published, the provisional figures before).
 */
export async function participationFlags(
  db: Database,
  period: string,
  labIds: readonly string[],
): Promise<Map<string, ParticipationFlag[]>> {
  const flags = new Map<string, ParticipationFlag[]>();
  for (const labId of labIds) {
    const report = await buildPeerReport(db, boardReader, labId, period);
    const found: ParticipationFlag[] = [];
    for (const row of report.rows) {
      const where = { procedureId: row.procedure.id, controlLotId: row.controlLot.id, level: row.level };
      if (row.sdi !== null && Math.abs(row.sdi) > SDI_ACTION)
        found.push({ kind: 'sdi', ...where, value: row.sdi });
      if (row.cvr !== null && row.cvr > CVR_ACTION) found.push({ kind: 'cvr', ...where, value: row.cvr });
      if (row.excluded?.reason === 'outlier') found.push({ kind: 'excluded-outlier', ...where, value: null });
      if (row.notComputable) found.push({ kind: 'not-computable', ...where, value: null });
    }
    flags.set(labId, found);
  }
  return flags;
}
