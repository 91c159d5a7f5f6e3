import { and, asc, desc, eq, inArray, lte } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  labs,
  peerGroups,
  peerStatistics,
  peerStatisticsFailures,
  procedures,
  publications,
  qcSummaries,
  type Executor,
} from '@plumbline/db';

export async function findLab(db: Executor, labId: string) {
  const [lab] = await db
    .select({ id: labs.id, code: labs.code, name: labs.name, preferredUnits: labs.preferredUnits })
    .from(labs)
    .where(eq(labs.id, labId))
    .limit(1);
  return lab ?? null;
}

/** The latest publication of the period, or null while its figures are provisional. */
export async function latestPublication(db: Executor, period: string) {
  const [row] = await db
    .select({ version: publications.version, publishedAt: publications.publishedAt })
    .from(publications)
    .where(eq(publications.period, period))
    .orderBy(desc(publications.version))
    .limit(1);
  return row ?? null;
}

/** The lab's monthly summaries of the period with their procedure, analyte and control lot. */
export async function labSummaries(db: Executor, labId: string, period: string) {
  return db
    .select({
      procedureId: procedures.id,
      procedureCode: procedures.code,
      analyteId: analytes.id,
      analyte: {
        code: analytes.code,
        name: analytes.name,
        unit: analytes.unit,
        decimals: analytes.decimals,
        teaPct: analytes.teaPct,
        teaAbsolute: analytes.teaAbsolute,
        teaSource: analytes.teaSource,
      },
      conventionalUnit: analytes.conventionalUnit,
      molarMass: analytes.molarMass,
      controlLotId: controlLots.id,
      lotNumber: controlLots.lotNumber,
      level: qcSummaries.level,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
      source: qcSummaries.source,
      late: qcSummaries.late,
    })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(controlLots, eq(controlLots.id, qcSummaries.controlLotId))
    .where(and(eq(qcSummaries.labId, labId), eq(qcSummaries.period, period)))
    .orderBy(asc(analytes.name), asc(procedures.code), asc(controlLots.lotNumber), asc(qcSummaries.level));
}

/** Summaries of the given procedures up to and including the period (for lot-to-date figures). */
export async function summariesToDate(db: Executor, procedureIds: string[], period: string) {
  if (procedureIds.length === 0) return [];
  return db
    .select({
      procedureId: qcSummaries.procedureId,
      controlLotId: qcSummaries.controlLotId,
      level: qcSummaries.level,
      period: qcSummaries.period,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .where(and(inArray(qcSummaries.procedureId, procedureIds), lte(qcSummaries.period, period)))
    .orderBy(asc(qcSummaries.period));
}

export type PeerStatisticsRow = typeof peerStatistics.$inferSelect;
export type LabSummaryRow = Awaited<ReturnType<typeof labSummaries>>[number];

/** Groups of the period whose provisional figures the last recompute could not compute. */
export async function statisticsFailuresFor(db: Executor, groupIds: string[], period: string) {
  if (groupIds.length === 0) return [];
  return db
    .select()
    .from(peerStatisticsFailures)
    .where(
      and(inArray(peerStatisticsFailures.peerGroupId, groupIds), eq(peerStatisticsFailures.period, period)),
    );
}

export async function peerStatisticsFor(
  db: Executor,
  groupIds: string[],
  period: string,
  versions: number[],
) {
  if (groupIds.length === 0) return [];
  return db
    .select()
    .from(peerStatistics)
    .where(
      and(
        inArray(peerStatistics.peerGroupId, groupIds),
        eq(peerStatistics.period, period),
        inArray(peerStatistics.version, versions),
      ),
    );
}

/**
 * The rows of a published snapshot for these control lots, with each group's tier: a published report
 * places a procedure in the group whose snapshot lists it as a member, so later merges or moves do not
 * change what was published.
 */
export async function publishedSnapshot(db: Executor, lotIds: string[], period: string, version: number) {
  if (lotIds.length === 0 || version === 0) return [];
  const rows = await db
    .select({ stat: peerStatistics, tier: peerGroups.tier, controlLotId: peerGroups.controlLotId })
    .from(peerStatistics)
    .innerJoin(peerGroups, eq(peerGroups.id, peerStatistics.peerGroupId))
    .where(
      and(
        inArray(peerGroups.controlLotId, lotIds),
        eq(peerStatistics.period, period),
        eq(peerStatistics.version, version),
      ),
    );
  return rows.map((r) => ({ ...r.stat, tier: r.tier, controlLotId: r.controlLotId }));
}
