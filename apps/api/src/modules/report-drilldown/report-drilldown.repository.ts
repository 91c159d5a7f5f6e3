import { and, asc, eq, inArray, lte, max } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  peerStatistics,
  procedures,
  publications,
  qcSummaries,
  qcValues,
  type Executor,
} from '@plumbline/db';

/** The lab's procedure with its analyte (units, decimals), or null when it is not the lab's. */
export async function findProcedure(db: Executor, labId: string, procedureId: string) {
  const [row] = await db
    .select({
      id: procedures.id,
      code: procedures.code,
      analyteId: analytes.id,
      analyte: {
        code: analytes.code,
        name: analytes.name,
        unit: analytes.unit,
        conventionalUnit: analytes.conventionalUnit,
        molarMass: analytes.molarMass,
        decimals: analytes.decimals,
      },
    })
    .from(procedures)
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .where(and(eq(procedures.id, procedureId), eq(procedures.labId, labId)))
    .limit(1);
  return row ?? null;
}

export async function findControlLot(db: Executor, controlLotId: string) {
  const [row] = await db
    .select({ id: controlLots.id, lotNumber: controlLots.lotNumber, levels: controlLots.levels })
    .from(controlLots)
    .where(eq(controlLots.id, controlLotId))
    .limit(1);
  return row ?? null;
}

export type SummaryRow = {
  procedureId: string;
  level: number;
  period: string;
  n: number;
  mean: number;
  sd: number;
};

/** Monthly summaries of some procedures for a lot, up to and including a period, oldest first. */
export async function summariesOf(
  db: Executor,
  procedureIds: string[],
  controlLotId: string,
  upTo: string,
): Promise<SummaryRow[]> {
  if (procedureIds.length === 0) return [];
  return db
    .select({
      procedureId: qcSummaries.procedureId,
      level: qcSummaries.level,
      period: qcSummaries.period,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .where(
      and(
        inArray(qcSummaries.procedureId, procedureIds),
        eq(qcSummaries.controlLotId, controlLotId),
        lte(qcSummaries.period, upTo),
      ),
    )
    .orderBy(asc(qcSummaries.period));
}

/** The latest published version of each of the periods (periods never published are absent). */
export async function publishedVersions(db: Executor, periods: string[]): Promise<Map<string, number>> {
  if (periods.length === 0) return new Map();
  const rows = await db
    .select({ period: publications.period, version: max(publications.version) })
    .from(publications)
    .where(inArray(publications.period, periods))
    .groupBy(publications.period);
  return new Map(rows.filter((r) => r.version !== null).map((r) => [r.period, r.version!]));
}

export type PeerStatisticsRow = typeof peerStatistics.$inferSelect;

export async function peerStatisticsOf(
  db: Executor,
  groupIds: string[],
  periods: string[],
  versions: number[],
) {
  if (groupIds.length === 0 || periods.length === 0) return [];
  return db
    .select()
    .from(peerStatistics)
    .where(
      and(
        inArray(peerStatistics.peerGroupId, groupIds),
        inArray(peerStatistics.period, periods),
        inArray(peerStatistics.version, versions),
      ),
    );
}

/** The daily values of one procedure and lot in a period (every level: the across-level rules need them). */
export async function dailyValues(db: Executor, procedureId: string, controlLotId: string, period: string) {
  return db
    .select({
      id: qcValues.id,
      level: qcValues.level,
      measuredAt: qcValues.measuredAt,
      value: qcValues.value,
      run: qcValues.run,
    })
    .from(qcValues)
    .where(
      and(
        eq(qcValues.procedureId, procedureId),
        eq(qcValues.controlLotId, controlLotId),
        eq(qcValues.period, period),
      ),
    )
    .orderBy(asc(qcValues.measuredAt), asc(qcValues.level), asc(qcValues.id));
}

/** Monthly summaries of some procedures for a lot in one period (every level). */
export async function summariesInPeriod(
  db: Executor,
  procedureIds: string[],
  controlLotId: string,
  period: string,
): Promise<SummaryRow[]> {
  if (procedureIds.length === 0) return [];
  return db
    .select({
      procedureId: qcSummaries.procedureId,
      level: qcSummaries.level,
      period: qcSummaries.period,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .where(
      and(
        inArray(qcSummaries.procedureId, procedureIds),
        eq(qcSummaries.controlLotId, controlLotId),
        eq(qcSummaries.period, period),
      ),
    );
}
