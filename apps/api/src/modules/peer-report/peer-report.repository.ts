import { and, asc, desc, eq, inArray, lte, sql } from 'drizzle-orm';
import {
  analytes,
  controlLots,
  labs,
  peerStatistics,
  peerStatisticsFailures,
  procedures,
  publications,
  qcSummaries,
  type ExcludedLab,
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

/** The figures of a peer statistics row a report reads (never its member list, which grows with the network). */
const statisticsColumns = {
  peerGroupId: peerStatistics.peerGroupId,
  level: peerStatistics.level,
  scope: peerStatistics.scope,
  version: peerStatistics.version,
  labs: peerStatistics.labs,
  n: peerStatistics.n,
  mean: peerStatistics.mean,
  sd: peerStatistics.sd,
  cv: peerStatistics.cv,
  withinCv: peerStatistics.withinCv,
  sufficient: peerStatistics.sufficient,
  excluded: peerStatistics.excluded,
};

export type PeerStatisticsRow = {
  peerGroupId: string;
  level: number;
  scope: string;
  version: number;
  labs: number;
  n: number;
  mean: number | null;
  sd: number | null;
  cv: number | null;
  withinCv: number | null;
  sufficient: boolean;
  excluded: ExcludedLab[];
};
export type LabSummaryRow = Awaited<ReturnType<typeof labSummaries>>[number];

/** Groups of the period whose provisional figures the last recompute could not compute. */
export async function statisticsFailuresFor(db: Executor, groupIds: string[], period: string) {
  if (groupIds.length === 0) return [];
  return db
    .select({
      peerGroupId: peerStatisticsFailures.peerGroupId,
      level: peerStatisticsFailures.level,
      scope: peerStatisticsFailures.scope,
      reason: peerStatisticsFailures.reason,
    })
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
): Promise<PeerStatisticsRow[]> {
  if (groupIds.length === 0) return [];
  return db
    .select(statisticsColumns)
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
 * The rows of a published snapshot for these control lots that list one of these procedures as a member,
 * once per such procedure, with the group's tier: a published report places a procedure in the group
 * whose snapshot lists it as a member, so later merges or moves do not change what was published.
 * Membership is read from the narrow published-members table by procedure, so only the rows of the
 * lab's own groups are read, however large the network (never the member lists themselves).
 */
export async function publishedSnapshot(
  db: Executor,
  lotIds: string[],
  procedureIds: string[],
  period: string,
  version: number,
): Promise<(PeerStatisticsRow & { tier: string; controlLotId: string; procedureId: string })[]> {
  if (lotIds.length === 0 || procedureIds.length === 0 || version === 0) return [];
  const rows = await db.execute<
    PeerStatisticsRow & { tier: string; controlLotId: string; procedureId: string }
  >(sql`
    select ps.peer_group_id as "peerGroupId", ps.level, ps.scope, ps.version, ps.labs, ps.n, ps.mean, ps.sd,
           ps.cv, ps.within_cv as "withinCv", ps.sufficient, ps.excluded,
           g.tier, g.control_lot_id as "controlLotId", p.procedure_id as "procedureId"
      from published_statistics_members p
      join peer_statistics ps on ps.id = p.peer_statistics_id
      join peer_groups g on g.id = ps.peer_group_id
     where p.procedure_id = any(${sql.param(procedureIds)}::uuid[])
       and g.control_lot_id = any(${sql.param(lotIds)}::uuid[])
       and ps.period = ${period} and ps.version = ${version}
     order by ps.id`);
  return rows.rows;
}
