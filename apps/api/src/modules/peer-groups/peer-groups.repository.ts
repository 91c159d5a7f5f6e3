import { and, asc, desc, eq, inArray, isNull, or, sql } from 'drizzle-orm';
import {
  analytes,
  auditEvents,
  controlLots,
  instrumentModels,
  labs,
  methods,
  peerExclusions,
  peerGroupAssignments,
  peerGroups,
  peerStatistics,
  peerStatisticsFailures,
  periods,
  procedures,
  publications,
  qcSummaries,
  reagents,
  users,
  type Executor,
} from '@plumbline/db';
import type {
  AssignmentRow,
  ExclusionEntry,
  GroupRow,
  ProcedureInfo,
  SummaryEntry,
} from './peer-group-model.ts';

export async function findControlLot(db: Executor, id: string) {
  const [row] = await db
    .select({ id: controlLots.id, lotNumber: controlLots.lotNumber, levels: controlLots.levels })
    .from(controlLots)
    .where(eq(controlLots.id, id))
    .limit(1);
  return row ? { ...row, levels: [...row.levels].sort((a, b) => a - b) } : null;
}

export async function findAnalyte(db: Executor, id: string) {
  const [row] = await db
    .select({
      id: analytes.id,
      code: analytes.code,
      name: analytes.name,
      unit: analytes.unit,
      decimals: analytes.decimals,
    })
    .from(analytes)
    .where(eq(analytes.id, id))
    .limit(1);
  return row ?? null;
}

export async function findPeriod(db: Executor, period: string) {
  const [row] = await db.select().from(periods).where(eq(periods.period, period)).limit(1);
  return row ?? null;
}

export async function latestPublication(db: Executor, period: string) {
  const [row] = await db
    .select({ version: publications.version, publishedAt: publications.publishedAt })
    .from(publications)
    .where(eq(publications.period, period))
    .orderBy(desc(publications.version))
    .limit(1);
  return row ?? null;
}

/** Analytes with QC data on the lot. */
export async function analytesWithData(db: Executor, controlLotId: string) {
  return db
    .selectDistinct({ id: analytes.id, code: analytes.code, name: analytes.name, unit: analytes.unit })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .where(eq(qcSummaries.controlLotId, controlLotId))
    .orderBy(asc(analytes.name), asc(analytes.code));
}

const procedureColumns = {
  id: procedures.id,
  code: procedures.code,
  analyteId: procedures.analyteId,
  analyteName: analytes.name,
  instrumentModelId: procedures.instrumentModelId,
  instrumentModelName: instrumentModels.name,
  methodId: procedures.methodId,
  methodName: methods.name,
  reagentId: procedures.reagentId,
  reagentName: reagents.name,
  lab: { id: labs.id, code: labs.code, name: labs.name },
};

function procedureQuery(db: Executor) {
  return db
    .select(procedureColumns)
    .from(procedures)
    .innerJoin(labs, eq(labs.id, procedures.labId))
    .innerJoin(analytes, eq(analytes.id, procedures.analyteId))
    .innerJoin(instrumentModels, eq(instrumentModels.id, procedures.instrumentModelId))
    .innerJoin(methods, eq(methods.id, procedures.methodId))
    .innerJoin(reagents, eq(reagents.id, procedures.reagentId));
}

/** The procedures of the analyte with QC data on the lot in any period: the peer groups' possible members. */
export async function lotProcedures(
  db: Executor,
  controlLotId: string,
  analyteId: string,
): Promise<ProcedureInfo[]> {
  return procedureQuery(db)
    .where(
      and(
        eq(procedures.analyteId, analyteId),
        sql`exists (select 1 from ${qcSummaries} where ${qcSummaries.procedureId} = ${procedures.id} and ${qcSummaries.controlLotId} = ${controlLotId})`,
      ),
    )
    .orderBy(asc(labs.code), asc(procedures.code));
}

export async function findProcedure(db: Executor, id: string): Promise<ProcedureInfo | null> {
  const [row] = await procedureQuery(db).where(eq(procedures.id, id)).limit(1);
  return row ?? null;
}

export async function groupsOf(db: Executor, controlLotId: string, analyteId: string): Promise<GroupRow[]> {
  return db
    .select({
      id: peerGroups.id,
      tier: peerGroups.tier,
      key: peerGroups.key,
      label: peerGroups.label,
      mergedIntoId: peerGroups.mergedIntoId,
    })
    .from(peerGroups)
    .where(and(eq(peerGroups.controlLotId, controlLotId), eq(peerGroups.analyteId, analyteId)));
}

export async function findGroup(db: Executor, id: string) {
  const [row] = await db.select().from(peerGroups).where(eq(peerGroups.id, id)).limit(1);
  return row ?? null;
}

export async function assignmentsOf(
  db: Executor,
  controlLotId: string,
  procedureIds: readonly string[],
): Promise<AssignmentRow[]> {
  if (procedureIds.length === 0) return [];
  return db
    .select({
      procedureId: peerGroupAssignments.procedureId,
      tier: peerGroupAssignments.tier,
      peerGroupId: peerGroupAssignments.peerGroupId,
    })
    .from(peerGroupAssignments)
    .where(
      and(
        eq(peerGroupAssignments.controlLotId, controlLotId),
        inArray(peerGroupAssignments.procedureId, [...procedureIds]),
      ),
    );
}

export async function summariesOf(
  db: Executor,
  controlLotId: string,
  analyteId: string,
  period: string,
  levels: readonly number[],
): Promise<SummaryEntry[]> {
  if (levels.length === 0) return [];
  return db
    .select({
      procedureId: qcSummaries.procedureId,
      level: qcSummaries.level,
      n: qcSummaries.n,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
      late: qcSummaries.late,
    })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .where(
      and(
        eq(qcSummaries.controlLotId, controlLotId),
        eq(procedures.analyteId, analyteId),
        eq(qcSummaries.period, period),
        inArray(qcSummaries.level, [...levels]),
      ),
    );
}

/** The coordinator's exclusions in force for the lot and period (of one analyte when given). */
export async function activeExclusions(
  db: Executor,
  controlLotId: string,
  period: string,
  analyteId?: string,
) {
  return db
    .select({
      id: peerExclusions.id,
      procedureId: peerExclusions.procedureId,
      procedureCode: procedures.code,
      lab: { id: labs.id, code: labs.code, name: labs.name },
      level: peerExclusions.level,
      period: peerExclusions.period,
      reason: peerExclusions.reason,
      createdAt: peerExclusions.createdAt,
    })
    .from(peerExclusions)
    .innerJoin(procedures, eq(procedures.id, peerExclusions.procedureId))
    .innerJoin(labs, eq(labs.id, procedures.labId))
    .where(
      and(
        eq(peerExclusions.controlLotId, controlLotId),
        eq(peerExclusions.period, period),
        isNull(peerExclusions.revokedAt),
        analyteId ? eq(procedures.analyteId, analyteId) : undefined,
      ),
    )
    .orderBy(asc(peerExclusions.createdAt));
}

export const toExclusionEntries = (rows: Awaited<ReturnType<typeof activeExclusions>>): ExclusionEntry[] =>
  rows.map((r) => ({ procedureId: r.procedureId, level: r.level, reason: r.reason }));

/** Stored period figures of the groups for a level and period, at the given versions. */
export async function periodStatistics(
  db: Executor,
  groupIds: readonly string[],
  level: number,
  period: string,
  versions: readonly number[],
) {
  if (groupIds.length === 0) return [];
  return db
    .select()
    .from(peerStatistics)
    .where(
      and(
        inArray(peerStatistics.peerGroupId, [...groupIds]),
        eq(peerStatistics.level, level),
        eq(peerStatistics.period, period),
        eq(peerStatistics.scope, 'period'),
        inArray(peerStatistics.version, [...versions]),
      ),
    );
}

/** Every level and period of the lot and analyte with data (of one period, or some levels, when given): what a change must recompute. */
/** The period-scope failures of the last recompute for these groups and level. */
export async function periodFailures(db: Executor, groupIds: string[], level: number, period: string) {
  if (groupIds.length === 0) return [];
  return db
    .select()
    .from(peerStatisticsFailures)
    .where(
      and(
        inArray(peerStatisticsFailures.peerGroupId, groupIds),
        eq(peerStatisticsFailures.level, level),
        eq(peerStatisticsFailures.period, period),
        eq(peerStatisticsFailures.scope, 'period'),
      ),
    );
}

export async function dataTargets(
  db: Executor,
  controlLotId: string,
  analyteId: string,
  only: { period?: string; levels?: readonly number[] } = {},
) {
  const rows = await db
    .selectDistinct({ level: qcSummaries.level, period: qcSummaries.period })
    .from(qcSummaries)
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .where(
      and(
        eq(qcSummaries.controlLotId, controlLotId),
        eq(procedures.analyteId, analyteId),
        only.period ? eq(qcSummaries.period, only.period) : undefined,
        only.levels ? inArray(qcSummaries.level, [...only.levels]) : undefined,
      ),
    );
  return rows.map((r) => ({ controlLotId, analyteId, level: r.level, period: r.period }));
}

/** Levels at which the procedure has data on the lot for the period. */
export async function procedureLevelsWithData(
  db: Executor,
  procedureId: string,
  controlLotId: string,
  period: string,
) {
  const rows = await db
    .select({ level: qcSummaries.level })
    .from(qcSummaries)
    .where(
      and(
        eq(qcSummaries.procedureId, procedureId),
        eq(qcSummaries.controlLotId, controlLotId),
        eq(qcSummaries.period, period),
      ),
    )
    .orderBy(asc(qcSummaries.level));
  return rows.map((r) => r.level);
}

export async function findActiveExclusionOverlap(
  db: Executor,
  input: { procedureId: string; controlLotId: string; period: string; level: number | null },
) {
  const [row] = await db
    .select({ id: peerExclusions.id, level: peerExclusions.level })
    .from(peerExclusions)
    .where(
      and(
        eq(peerExclusions.procedureId, input.procedureId),
        eq(peerExclusions.controlLotId, input.controlLotId),
        eq(peerExclusions.period, input.period),
        isNull(peerExclusions.revokedAt),
        // Every-level exclusions overlap anything; a level exclusion overlaps the same level.
        input.level === null
          ? undefined
          : or(isNull(peerExclusions.level), eq(peerExclusions.level, input.level)),
      ),
    )
    .limit(1);
  return row ?? null;
}

// ---------- the adjustment ledger (audit events) ----------

export const ADJUSTMENT_EVENT_KINDS = [
  'peer-group.merge',
  'peer-group.split',
  'peer-group.move',
  'peer-group.exclude',
] as const;
export const UNDO_EVENT_KIND = 'peer-group.undo';

export async function adjustmentEvents(
  db: Executor,
  filter: { controlLotId?: string; analyteId?: string; id?: number },
) {
  return db
    .select({ event: auditEvents, actor: { id: users.id, name: users.name } })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(
      and(
        inArray(auditEvents.kind, [...ADJUSTMENT_EVENT_KINDS]),
        filter.id !== undefined ? eq(auditEvents.id, filter.id) : undefined,
        filter.controlLotId
          ? sql`${auditEvents.details}->>'controlLotId' = ${filter.controlLotId}`
          : undefined,
        filter.analyteId ? sql`${auditEvents.details}->>'analyteId' = ${filter.analyteId}` : undefined,
      ),
    )
    .orderBy(desc(auditEvents.id))
    .limit(500);
}

export async function undoEvents(db: Executor, adjustmentIds: readonly number[]) {
  if (adjustmentIds.length === 0) return [];
  return db
    .select({ event: auditEvents, actor: { id: users.id, name: users.name } })
    .from(auditEvents)
    .leftJoin(users, eq(users.id, auditEvents.actorId))
    .where(
      and(
        eq(auditEvents.kind, UNDO_EVENT_KIND),
        inArray(sql`(${auditEvents.details}->>'adjustmentId')::bigint`, [...adjustmentIds]),
      ),
    );
}
