// Peer groups for the coordinator: the view of one control lot, analyte, level and period, and the
// adjustments — merge, split, move, exclude — each with a preview (computed in memory, nothing
// written), an audited apply that recomputes the provisional figures, and an undo. The adjustments
// are recorded as audit events (kind `peer-group.<adjustment>`), which are also the list the page
// shows; an undo is a `peer-group.undo` event naming the adjustment.
import { and, eq, sql } from 'drizzle-orm';
import {
  PEER_TIERS,
  auditEvents,
  drainPeerStatisticsRequests,
  peerExclusions,
  peerGroupAssignments,
  peerGroups,
  requestPeerStatistics,
  type Database,
  type Executor,
  type PeerStatisticsTarget,
  type PeerTierName,
  thresholds,
} from '@plumbline/db';
import {
  adjustmentListQuerySchema,
  adjustmentUndoSchema,
  exclusionPreviewRequestSchema,
  exclusionRequestSchema,
  mergePreviewRequestSchema,
  mergeRequestSchema,
  movePreviewRequestSchema,
  moveRequestSchema,
  peerGroupAnalytesQuerySchema,
  peerGroupsQuerySchema,
  splitPreviewRequestSchema,
  splitRequestSchema,
  type AdjustmentKind,
  type AdjustmentPreview,
  type PeerGroup,
  type PeerGroupAdjustment,
  type PeerGroupAnalyte,
  type PeerGroupFigures,
  type PeerGroupsView,
  type SplitCriterion,
} from '@plumbline/contracts';
import { actorOf, type Principal } from '../../auth/principal.ts';
import { badRequest, conflict, notFound, validationFailed } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import {
  membersOf,
  previewGroups,
  resolveMembership,
  survivingGroup,
  type AssignmentRow,
  type ExclusionEntry,
  type GroupRow,
  type Layout,
  type ProcedureInfo,
  type SummaryEntry,
} from './peer-group-model.ts';
import * as repo from './peer-groups.repository.ts';

/** Labs that must remain for figures to be published (docs/methods.md §2), the one setting the worker also uses. */
const minLabs = () => thresholds().peerMinLabs;
/** Adjustments and their undos run one at a time, so each sees the arrangement the previous one left. */
const ADJUSTMENT_LOCK_KEY = 740_100_002;

const tierText: Record<PeerTierName, string> = {
  instrument: 'instrument model, method and reagent',
  method: 'method',
  analyte: 'analyte',
};
const criterionText: Record<SplitCriterion, string> = {
  reagent: 'reagent',
  instrumentModel: 'instrument model',
};

/** 422 naming the field that is wrong, in the shape parseInput uses for 400s. */
function fieldError(path: string, message: string) {
  return validationFailed(`${path}: ${message}`, [{ path, message }]);
}

const procedureName = (p: ProcedureInfo) => `${p.lab.code} ${p.code}`;

// ---------- the view ----------

type StatisticsRow = Awaited<ReturnType<typeof repo.periodStatistics>>[number];

function figuresOfRow(row: StatisticsRow): PeerGroupFigures {
  return {
    labs: row.labs,
    n: row.n,
    mean: row.mean,
    sd: row.sd,
    cv: row.cv,
    withinSd: row.withinSd,
    withinCv: row.withinCv,
    robustMean: row.robustMean,
    robustSd: row.robustSd,
    sufficient: row.sufficient,
    excluded: row.excluded.map((e) => ({ procedureId: e.id, reason: e.reason, note: e.note ?? null })),
  };
}

export async function listAnalytes(db: Database, rawQuery: unknown): Promise<PeerGroupAnalyte[]> {
  const query = parseInput(peerGroupAnalytesQuerySchema, rawQuery, 'query');
  if (!(await repo.findControlLot(db, query.controlLotId))) throw notFound('Control lot');
  return repo.analytesWithData(db, query.controlLotId);
}

export async function peerGroupsView(db: Database, rawQuery: unknown): Promise<PeerGroupsView> {
  const query = parseInput(peerGroupsQuerySchema, rawQuery, 'query');
  const lot = await repo.findControlLot(db, query.controlLotId);
  if (!lot) throw notFound('Control lot');
  const analyte = await repo.findAnalyte(db, query.analyteId);
  if (!analyte) throw notFound('Analyte');
  if (!lot.levels.includes(query.level)) {
    const message = `the lot ${lot.lotNumber} has levels ${lot.levels.join(', ')}`;
    throw badRequest(`Invalid query: level: ${message}`, [{ path: 'level', message }]);
  }

  const [procedures, groups, periodRow, publication, summaries, exclusionRows] = await Promise.all([
    repo.lotProcedures(db, lot.id, analyte.id),
    repo.groupsOf(db, lot.id, analyte.id),
    repo.findPeriod(db, query.period),
    repo.latestPublication(db, query.period),
    repo.summariesOf(db, lot.id, analyte.id, query.period, [query.level]),
    repo.activeExclusions(db, lot.id, query.period, analyte.id),
  ]);
  const assignments = await repo.assignmentsOf(
    db,
    lot.id,
    procedures.map((p) => p.id),
  );
  const membership = resolveMembership({ groups, assignments }, procedures);
  const assigned = new Set(assignments.map((a) => `${a.procedureId}|${a.tier}`));
  const byId = new Map(groups.map((g) => [g.id, g]));
  const procedureById = new Map(procedures.map((p) => [p.id, p]));
  const summaryOf = new Map(summaries.map((s) => [s.procedureId, s]));

  const shownIds = new Set<string>();
  for (const entry of membership.values()) for (const g of Object.values(entry)) if (g) shownIds.add(g.id);
  const versions = publication ? [0, publication.version] : [0];
  const statistics = await repo.periodStatistics(db, [...shownIds], query.level, query.period, versions);
  const failures = await repo.periodFailures(db, [...shownIds], query.level, query.period);

  const notComputableOf = (failure: (typeof failures)[number] | undefined) =>
    failure ? { reason: failure.reason, failedAt: failure.failedAt.toISOString() } : null;
  const buildGroup = (group: GroupRow): PeerGroup => {
    const provisional = statistics.find((r) => r.peerGroupId === group.id && r.version === 0);
    const published = publication
      ? statistics.find((r) => r.peerGroupId === group.id && r.version === publication.version)
      : undefined;
    const members = membersOf(membership, group)
      .map((procedureId) => {
        const p = procedureById.get(procedureId)!;
        const s = summaryOf.get(procedureId);
        const excluded = provisional?.excluded.find((e) => e.id === procedureId);
        return {
          procedureId,
          procedureCode: p.code,
          lab: p.lab,
          instrumentModel: { id: p.instrumentModelId, name: p.instrumentModelName },
          method: { id: p.methodId, name: p.methodName },
          reagent: { id: p.reagentId, name: p.reagentName },
          assigned: assigned.has(`${procedureId}|${group.tier}`),
          data: s
            ? {
                n: s.n,
                mean: s.mean,
                sd: s.sd,
                cv: s.mean !== 0 ? (100 * s.sd) / Math.abs(s.mean) : null,
                late: s.late,
              }
            : null,
          excluded: excluded ? { reason: excluded.reason, note: excluded.note ?? null } : null,
        };
      })
      .sort((a, b) => a.lab.code.localeCompare(b.lab.code) || a.procedureCode.localeCompare(b.procedureCode));
    return {
      id: group.id,
      tier: group.tier,
      key: group.key,
      label: group.label,
      mergedFrom: groups
        .filter((g) => g.id !== group.id && g.mergedIntoId && survivingGroup(byId, g.id)?.id === group.id)
        .map((g) => ({ id: g.id, label: g.label })),
      members,
      labsWithData: new Set(members.filter((m) => m.data).map((m) => m.lab.id)).size,
      provisional: provisional ? figuresOfRow(provisional) : null,
      notComputable: notComputableOf(failures.find((f) => f.peerGroupId === group.id)),
      published:
        published && publication ? { ...figuresOfRow(published), version: publication.version } : null,
    };
  };

  return {
    controlLot: lot,
    analyte,
    level: query.level,
    period: query.period,
    periodState: periodRow?.state ?? null,
    publication: publication
      ? { version: publication.version, publishedAt: publication.publishedAt.toISOString() }
      : null,
    minLabs: minLabs(),
    tiers: PEER_TIERS.map((tier) => ({
      tier,
      groups: groups
        .filter((g) => g.tier === tier && shownIds.has(g.id))
        .map(buildGroup)
        .sort((a, b) => b.labsWithData - a.labsWithData || a.label.localeCompare(b.label)),
    })),
    exclusions: exclusionRows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() })),
  };
}

// ---------- what previews and applies share ----------

/** Everything a preview needs about one lot and analyte, for one period. */
/** `period` null: the arrangement only (an apply, which holds for every period). */
async function loadContext(db: Executor, controlLotId: string, analyteId: string, period: string | null) {
  const lot = await repo.findControlLot(db, controlLotId);
  if (!lot) throw notFound('Control lot');
  const procedures = await repo.lotProcedures(db, controlLotId, analyteId);
  const [groups, assignments, summaries, exclusionRows] = await Promise.all([
    repo.groupsOf(db, controlLotId, analyteId),
    repo.assignmentsOf(
      db,
      controlLotId,
      procedures.map((p) => p.id),
    ),
    period ? repo.summariesOf(db, controlLotId, analyteId, period, lot.levels) : [],
    period ? repo.activeExclusions(db, controlLotId, period, analyteId) : [],
  ]);
  return {
    lot,
    procedures,
    layout: { groups, assignments } as Layout,
    summaries: summaries as SummaryEntry[],
    exclusions: repo.toExclusionEntries(exclusionRows),
  };
}
type Context = Awaited<ReturnType<typeof loadContext>>;

function previewLevels(context: Context, level: number | undefined): number[] {
  if (level === undefined) return context.lot.levels;
  if (!context.lot.levels.includes(level)) {
    throw fieldError('level', `the lot ${context.lot.lotNumber} has levels ${context.lot.levels.join(', ')}`);
  }
  return [level];
}

function buildPreview(
  kind: AdjustmentKind,
  description: string,
  period: string,
  context: Context,
  levels: readonly number[],
  before: { scenario: { layout: Layout; exclusions: readonly ExclusionEntry[] }; groupIds: string[] },
  after: { scenario: { layout: Layout; exclusions: readonly ExclusionEntry[] }; groupIds: string[] },
  isNew?: (id: string) => boolean,
): AdjustmentPreview {
  return {
    kind,
    description,
    period,
    levels: levels.map((level) => {
      const common = {
        procedures: context.procedures,
        summaries: context.summaries,
        level,
        minLabs: minLabs(),
      };
      return {
        level,
        before: previewGroups(before.scenario, before.groupIds, common),
        after: previewGroups(after.scenario, after.groupIds, { ...common, isNew }),
      };
    }),
  };
}

type Applied = {
  kind: AdjustmentKind;
  controlLotId: string;
  analyteId: string;
  labId?: string | null;
  entity: string;
  entityId: string;
  description: string;
  reason: string;
  period?: string | null;
  /** What the undo needs. */
  details: Record<string, unknown>;
  targets: PeerStatisticsTarget[];
};

/**
 * Applies an adjustment in one transaction with its audit event and the recompute requests of the
 * figures it changes, then recomputes them before answering (so the next read shows them).
 */
async function applyAdjustment(
  db: Database,
  principal: Principal,
  work: (tx: Executor) => Promise<Applied>,
): Promise<PeerGroupAdjustment> {
  const eventId = await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${ADJUSTMENT_LOCK_KEY})`);
    const applied = await work(tx);
    const [event] = await tx
      .insert(auditEvents)
      .values({
        ...actorOf(principal),
        kind: `peer-group.${applied.kind}`,
        labId: applied.labId ?? null,
        entity: applied.entity,
        entityId: applied.entityId,
        details: {
          adjustment: applied.kind,
          controlLotId: applied.controlLotId,
          analyteId: applied.analyteId,
          period: applied.period ?? null,
          description: applied.description,
          reason: applied.reason,
          ...applied.details,
        },
      })
      .returning({ id: auditEvents.id });
    await requestPeerStatistics(tx, applied.targets);
    return event.id;
  });
  await drainPeerStatisticsRequests(db, { minLabs: minLabs() });
  const [adjustment] = await loadAdjustments(db, { id: eventId });
  return adjustment;
}

// ---------- merge ----------

async function mergePair(db: Executor, sourceGroupId: string, targetGroupId: string) {
  if (sourceGroupId === targetGroupId)
    throw fieldError('targetGroupId', 'choose two different groups to merge');
  const source = await repo.findGroup(db, sourceGroupId);
  if (!source) throw fieldError('sourceGroupId', 'no such peer group');
  const target = await repo.findGroup(db, targetGroupId);
  if (!target) throw fieldError('targetGroupId', 'no such peer group');
  if (source.controlLotId !== target.controlLotId || source.analyteId !== target.analyteId) {
    throw fieldError('targetGroupId', 'the groups belong to different control lots or analytes');
  }
  if (source.tier !== target.tier) {
    throw fieldError(
      'targetGroupId',
      `the groups are at different tiers (${source.tier} and ${target.tier}); merge groups of one tier`,
    );
  }
  for (const group of [source, target]) {
    if (group.mergedIntoId)
      throw conflict(`“${group.label}” is already merged into another group; use that group.`);
  }
  return { source, target };
}

export async function previewMerge(db: Database, rawBody: unknown): Promise<AdjustmentPreview> {
  const body = parseInput(mergePreviewRequestSchema, rawBody);
  const { source, target } = await mergePair(db, body.sourceGroupId, body.targetGroupId);
  const context = await loadContext(db, source.controlLotId, source.analyteId, body.period);
  const after: Layout = {
    groups: context.layout.groups.map((g) => (g.id === source.id ? { ...g, mergedIntoId: target.id } : g)),
    assignments: context.layout.assignments,
  };
  return buildPreview(
    'merge',
    `Merge “${source.label}” into “${target.label}”`,
    body.period,
    context,
    previewLevels(context, body.level),
    {
      scenario: { layout: context.layout, exclusions: context.exclusions },
      groupIds: [source.id, target.id],
    },
    { scenario: { layout: after, exclusions: context.exclusions }, groupIds: [target.id] },
  );
}

export async function applyMerge(db: Database, principal: Principal, rawBody: unknown) {
  const body = parseInput(mergeRequestSchema, rawBody);
  return applyAdjustment(db, principal, async (tx) => {
    const { source, target } = await mergePair(tx, body.sourceGroupId, body.targetGroupId);
    await tx.update(peerGroups).set({ mergedIntoId: target.id }).where(eq(peerGroups.id, source.id));
    return {
      kind: 'merge',
      controlLotId: source.controlLotId,
      analyteId: source.analyteId,
      entity: 'peer-group',
      entityId: target.id,
      description: `Merged “${source.label}” into “${target.label}” (${tierText[source.tier]} tier)`,
      reason: body.reason,
      details: { tier: source.tier, sourceGroupId: source.id, targetGroupId: target.id },
      targets: await repo.dataTargets(tx, source.controlLotId, source.analyteId),
    };
  });
}

// ---------- split ----------

type SplitPart = { value: string; name: string; procedureIds: string[] };

async function splitPlan(db: Executor, groupId: string, by: SplitCriterion, period: string | null) {
  const group = await repo.findGroup(db, groupId);
  if (!group) throw fieldError('groupId', 'no such peer group');
  if (group.mergedIntoId)
    throw conflict(`“${group.label}” is merged into another group; split that group instead.`);
  const context = await loadContext(db, group.controlLotId, group.analyteId, period);
  const membership = resolveMembership(context.layout, context.procedures);
  const procedureById = new Map(context.procedures.map((p) => [p.id, p]));
  const parts = new Map<string, SplitPart>();
  for (const procedureId of membersOf(membership, group)) {
    const p = procedureById.get(procedureId)!;
    const value = by === 'reagent' ? p.reagentId : p.instrumentModelId;
    const name = by === 'reagent' ? p.reagentName : p.instrumentModelName;
    const part = parts.get(value);
    if (part) part.procedureIds.push(procedureId);
    else parts.set(value, { value, name, procedureIds: [procedureId] });
  }
  if (parts.size < 2) {
    throw fieldError(
      'by',
      `every member of “${group.label}” uses the same ${criterionText[by]}; there is nothing to split`,
    );
  }
  const sorted = [...parts.values()].sort((a, b) => a.name.localeCompare(b.name));
  const keyOf = (part: SplitPart) => `${group.key}|${by}:${part.value}`;
  const labelOf = (part: SplitPart) => `${group.label} — ${criterionText[by]} ${part.name}`;
  return { group, context, parts: sorted, keyOf, labelOf };
}

export async function previewSplit(db: Database, rawBody: unknown): Promise<AdjustmentPreview> {
  const body = parseInput(splitPreviewRequestSchema, rawBody);
  const { group, context, parts, keyOf, labelOf } = await splitPlan(db, body.groupId, body.by, body.period);
  const newGroups: GroupRow[] = parts.map((part) => ({
    id: `new:${part.value}`,
    tier: group.tier,
    key: keyOf(part),
    label: labelOf(part),
    mergedIntoId: null,
  }));
  const moved = new Set(parts.flatMap((p) => p.procedureIds));
  const after: Layout = {
    groups: [...context.layout.groups, ...newGroups],
    assignments: [
      ...context.layout.assignments.filter((a) => !(a.tier === group.tier && moved.has(a.procedureId))),
      ...parts.flatMap((part) =>
        part.procedureIds.map((procedureId): AssignmentRow => ({
          procedureId,
          tier: group.tier,
          peerGroupId: `new:${part.value}`,
        })),
      ),
    ],
  };
  return buildPreview(
    'split',
    `Split “${group.label}” by ${criterionText[body.by]} into ${parts.length} groups`,
    body.period,
    context,
    previewLevels(context, body.level),
    { scenario: { layout: context.layout, exclusions: context.exclusions }, groupIds: [group.id] },
    { scenario: { layout: after, exclusions: context.exclusions }, groupIds: newGroups.map((g) => g.id) },
    (id) => id.startsWith('new:'),
  );
}

type AssignmentChange = {
  procedureId: string;
  tier: PeerTierName;
  newGroupId: string;
  previousGroupId: string | null;
};

/** Points each procedure's assignment at its new group, returning what was there before (for the undo). */
async function reassign(
  tx: Executor,
  controlLotId: string,
  changes: Omit<AssignmentChange, 'previousGroupId'>[],
) {
  const existing = await repo.assignmentsOf(
    tx,
    controlLotId,
    changes.map((c) => c.procedureId),
  );
  const result: AssignmentChange[] = [];
  for (const change of changes) {
    const previous = existing.find((a) => a.procedureId === change.procedureId && a.tier === change.tier);
    await tx
      .insert(peerGroupAssignments)
      .values({
        procedureId: change.procedureId,
        controlLotId,
        tier: change.tier,
        peerGroupId: change.newGroupId,
      })
      .onConflictDoUpdate({
        target: [
          peerGroupAssignments.procedureId,
          peerGroupAssignments.controlLotId,
          peerGroupAssignments.tier,
        ],
        set: { peerGroupId: change.newGroupId, createdAt: new Date() },
      });
    result.push({ ...change, previousGroupId: previous?.peerGroupId ?? null });
  }
  return result;
}

export async function applySplit(db: Database, principal: Principal, rawBody: unknown) {
  const body = parseInput(splitRequestSchema, rawBody);
  return applyAdjustment(db, principal, async (tx) => {
    // A split holds for every period; figures are only needed for a preview.
    const { group, parts, keyOf, labelOf } = await splitPlan(tx, body.groupId, body.by, null);
    await tx
      .insert(peerGroups)
      .values(
        parts.map((part) => ({
          controlLotId: group.controlLotId,
          analyteId: group.analyteId,
          tier: group.tier,
          key: keyOf(part),
          label: labelOf(part),
        })),
      )
      .onConflictDoNothing();
    const created = await repo.groupsOf(tx, group.controlLotId, group.analyteId);
    const groupIdOf = (part: SplitPart) =>
      created.find((g) => g.tier === group.tier && g.key === keyOf(part))!.id;
    const changes = await reassign(
      tx,
      group.controlLotId,
      parts.flatMap((part) =>
        part.procedureIds.map((procedureId) => ({
          procedureId,
          tier: group.tier,
          newGroupId: groupIdOf(part),
        })),
      ),
    );
    return {
      kind: 'split',
      controlLotId: group.controlLotId,
      analyteId: group.analyteId,
      entity: 'peer-group',
      entityId: group.id,
      description: `Split “${group.label}” by ${criterionText[body.by]} into ${parts.map((p) => `“${labelOf(p)}”`).join(', ')}`,
      reason: body.reason,
      details: {
        tier: group.tier,
        groupId: group.id,
        by: body.by,
        createdGroupIds: parts.map(groupIdOf),
        assignments: changes,
      },
      targets: await repo.dataTargets(tx, group.controlLotId, group.analyteId),
    };
  });
}

// ---------- move ----------

async function movePlan(db: Executor, procedureId: string, targetGroupId: string, period: string | null) {
  const procedure = await repo.findProcedure(db, procedureId);
  if (!procedure) throw fieldError('procedureId', 'no such measurement procedure');
  const target = await repo.findGroup(db, targetGroupId);
  if (!target) throw fieldError('targetGroupId', 'no such peer group');
  if (target.mergedIntoId)
    throw conflict(`“${target.label}” is merged into another group; move the procedure there instead.`);
  if (target.analyteId !== procedure.analyteId)
    throw fieldError('targetGroupId', 'the group is for another analyte');
  const context = await loadContext(db, target.controlLotId, target.analyteId, period);
  if (!context.procedures.some((p) => p.id === procedure.id)) {
    throw fieldError(
      'procedureId',
      `${procedureName(procedure)} has no QC data on the control lot ${context.lot.lotNumber}`,
    );
  }
  const current = resolveMembership(context.layout, context.procedures).get(procedure.id)?.[target.tier];
  if (current?.id === target.id)
    throw fieldError('targetGroupId', `${procedureName(procedure)} is already in “${target.label}”`);
  return { procedure, target, current, context };
}

export async function previewMove(db: Database, rawBody: unknown): Promise<AdjustmentPreview> {
  const body = parseInput(movePreviewRequestSchema, rawBody);
  const { procedure, target, current, context } = await movePlan(
    db,
    body.procedureId,
    body.targetGroupId,
    body.period,
  );
  const after: Layout = {
    groups: context.layout.groups,
    assignments: [
      ...context.layout.assignments.filter(
        (a) => !(a.procedureId === procedure.id && a.tier === target.tier),
      ),
      { procedureId: procedure.id, tier: target.tier, peerGroupId: target.id },
    ],
  };
  const ids = current ? [current.id, target.id] : [target.id];
  return buildPreview(
    'move',
    `Move ${procedureName(procedure)} from “${current?.label ?? 'no group'}” to “${target.label}”`,
    body.period,
    context,
    previewLevels(context, body.level),
    { scenario: { layout: context.layout, exclusions: context.exclusions }, groupIds: ids },
    { scenario: { layout: after, exclusions: context.exclusions }, groupIds: ids },
  );
}

export async function applyMove(db: Database, principal: Principal, rawBody: unknown) {
  const body = parseInput(moveRequestSchema, rawBody);
  return applyAdjustment(db, principal, async (tx) => {
    const { procedure, target, current } = await movePlan(tx, body.procedureId, body.targetGroupId, null);
    const changes = await reassign(tx, target.controlLotId, [
      { procedureId: procedure.id, tier: target.tier, newGroupId: target.id },
    ]);
    return {
      kind: 'move',
      controlLotId: target.controlLotId,
      analyteId: target.analyteId,
      labId: procedure.lab.id,
      entity: 'peer-group',
      entityId: target.id,
      description: `Moved ${procedureName(procedure)} from “${current?.label ?? 'no group'}” to “${target.label}” (${tierText[target.tier]} tier)`,
      reason: body.reason,
      details: {
        tier: target.tier,
        procedureId: procedure.id,
        fromGroupId: current?.id ?? null,
        targetGroupId: target.id,
        assignments: changes,
      },
      targets: await repo.dataTargets(tx, target.controlLotId, target.analyteId),
    };
  });
}

// ---------- exclude ----------

async function exclusionPlan(
  db: Executor,
  input: { procedureId: string; controlLotId: string; period: string; level?: number | null },
) {
  const procedure = await repo.findProcedure(db, input.procedureId);
  if (!procedure) throw fieldError('procedureId', 'no such measurement procedure');
  const lot = await repo.findControlLot(db, input.controlLotId);
  if (!lot) throw fieldError('controlLotId', 'no such control lot');
  const level = input.level ?? null;
  if (level !== null && !lot.levels.includes(level)) {
    throw fieldError('level', `the lot ${lot.lotNumber} has levels ${lot.levels.join(', ')}`);
  }
  const levelsWithData = await repo.procedureLevelsWithData(db, procedure.id, lot.id, input.period);
  const levels = level === null ? levelsWithData : levelsWithData.filter((l) => l === level);
  if (levels.length === 0) {
    throw fieldError(
      'period',
      `${procedureName(procedure)} has no data on the lot ${lot.lotNumber}${level === null ? '' : ` at level ${level}`} for ${input.period}`,
    );
  }
  if (
    await repo.findActiveExclusionOverlap(db, {
      procedureId: procedure.id,
      controlLotId: lot.id,
      period: input.period,
      level,
    })
  ) {
    throw conflict(
      `${procedureName(procedure)} is already excluded for ${input.period}${level === null ? '' : ` at level ${level}`}.`,
    );
  }
  const scope = `${input.period}${level === null ? ', every level' : `, level ${level}`}`;
  return { procedure, lot, level, levels, scope };
}

export async function previewExclusion(db: Database, rawBody: unknown): Promise<AdjustmentPreview> {
  const body = parseInput(exclusionPreviewRequestSchema, rawBody);
  const { procedure, lot, level, levels, scope } = await exclusionPlan(db, body);
  const context = await loadContext(db, lot.id, procedure.analyteId, body.period);
  const groups = resolveMembership(context.layout, context.procedures).get(procedure.id) ?? {};
  const ids = PEER_TIERS.map((tier) => groups[tier]?.id).filter((id): id is string => Boolean(id));
  const after = [...context.exclusions, { procedureId: procedure.id, level, reason: body.reason ?? '' }];
  return buildPreview(
    'exclude',
    `Exclude ${procedureName(procedure)} from the peer figures of ${scope}`,
    body.period,
    context,
    levels,
    { scenario: { layout: context.layout, exclusions: context.exclusions }, groupIds: ids },
    { scenario: { layout: context.layout, exclusions: after }, groupIds: ids },
  );
}

export async function applyExclusion(db: Database, principal: Principal, rawBody: unknown) {
  const body = parseInput(exclusionRequestSchema, rawBody);
  return applyAdjustment(db, principal, async (tx) => {
    const { procedure, lot, level, scope } = await exclusionPlan(tx, body);
    const [row] = await tx
      .insert(peerExclusions)
      .values({
        procedureId: procedure.id,
        controlLotId: lot.id,
        level,
        period: body.period,
        reason: body.reason,
        createdBy: principal.kind === 'user' ? principal.userId : null,
      })
      .returning({ id: peerExclusions.id });
    return {
      kind: 'exclude',
      controlLotId: lot.id,
      analyteId: procedure.analyteId,
      labId: procedure.lab.id,
      entity: 'peer-exclusion',
      entityId: row.id,
      period: body.period,
      description: `Excluded ${procedureName(procedure)} from the peer figures of ${scope}`,
      reason: body.reason,
      details: { exclusionId: row.id, procedureId: procedure.id, level },
      targets: await repo.dataTargets(tx, lot.id, procedure.analyteId, {
        period: body.period,
        levels: level === null ? undefined : [level],
      }),
    };
  });
}

// ---------- the list and undo ----------

type AdjustmentDetails = {
  adjustment: AdjustmentKind;
  controlLotId: string;
  analyteId: string;
  period: string | null;
  description: string;
  reason: string;
  sourceGroupId?: string;
  targetGroupId?: string;
  exclusionId?: string;
  level?: number | null;
  assignments?: AssignmentChange[];
};

async function loadAdjustments(
  db: Executor,
  filter: { controlLotId?: string; analyteId?: string; id?: number },
) {
  const rows = await repo.adjustmentEvents(db, filter);
  const undos = await repo.undoEvents(
    db,
    rows.map((r) => r.event.id),
  );
  return rows.map(({ event, actor }): PeerGroupAdjustment => {
    const details = event.details as AdjustmentDetails;
    const undo = undos.find(
      (u) => Number((u.event.details as { adjustmentId: unknown }).adjustmentId) === event.id,
    );
    return {
      id: event.id,
      kind: details.adjustment,
      description: details.description,
      reason: details.reason,
      at: event.at.toISOString(),
      actor: actor?.id ? { id: actor.id, name: actor.name } : null,
      controlLotId: details.controlLotId,
      analyteId: details.analyteId,
      period: details.period ?? null,
      undone: undo
        ? {
            at: undo.event.at.toISOString(),
            actor: undo.actor?.id ? { id: undo.actor.id, name: undo.actor.name } : null,
            reason: ((undo.event.details as { reason?: string | null }).reason ?? null) || null,
          }
        : null,
    };
  });
}

export async function listAdjustments(db: Database, rawQuery: unknown): Promise<PeerGroupAdjustment[]> {
  const query = parseInput(adjustmentListQuerySchema, rawQuery, 'query');
  return loadAdjustments(db, query);
}

const CHANGED_SINCE = 'a later change has rearranged these groups; undo the later adjustment first';

export async function undoAdjustment(db: Database, principal: Principal, rawId: string, rawBody: unknown) {
  const { reason } = parseInput(adjustmentUndoSchema, rawBody ?? {});
  const id = /^\d{1,15}$/.test(rawId) ? Number(rawId) : null;
  if (id === null) throw notFound('Adjustment');
  await db.transaction(async (tx) => {
    await tx.execute(sql`select pg_advisory_xact_lock(${ADJUSTMENT_LOCK_KEY})`);
    const [row] = await repo.adjustmentEvents(tx, { id });
    if (!row) throw notFound('Adjustment');
    if ((await repo.undoEvents(tx, [id])).length > 0)
      throw conflict('This adjustment has already been undone.');
    const details = row.event.details as AdjustmentDetails;

    if (details.adjustment === 'merge') {
      const source = await repo.findGroup(tx, details.sourceGroupId!);
      if (source?.mergedIntoId !== details.targetGroupId)
        throw conflict(`The merge cannot be undone: ${CHANGED_SINCE}.`);
      await tx.update(peerGroups).set({ mergedIntoId: null }).where(eq(peerGroups.id, source.id));
    } else if (details.adjustment === 'split' || details.adjustment === 'move') {
      const changes = details.assignments ?? [];
      const current = await repo.assignmentsOf(
        tx,
        details.controlLotId,
        changes.map((c) => c.procedureId),
      );
      for (const change of changes) {
        const now = current.find((a) => a.procedureId === change.procedureId && a.tier === change.tier);
        if (now?.peerGroupId !== change.newGroupId)
          throw conflict(`The ${details.adjustment} cannot be undone: ${CHANGED_SINCE}.`);
      }
      for (const change of changes) {
        const where = and(
          eq(peerGroupAssignments.procedureId, change.procedureId),
          eq(peerGroupAssignments.controlLotId, details.controlLotId),
          eq(peerGroupAssignments.tier, change.tier),
        );
        if (change.previousGroupId === null) await tx.delete(peerGroupAssignments).where(where);
        else await tx.update(peerGroupAssignments).set({ peerGroupId: change.previousGroupId }).where(where);
      }
    } else {
      const revoked = await tx
        .update(peerExclusions)
        .set({ revokedAt: new Date(), revokedBy: principal.kind === 'user' ? principal.userId : null })
        .where(and(eq(peerExclusions.id, details.exclusionId!), sql`${peerExclusions.revokedAt} is null`))
        .returning({ id: peerExclusions.id });
      if (revoked.length === 0) throw conflict('The exclusion has already been revoked.');
    }

    await tx.insert(auditEvents).values({
      ...actorOf(principal),
      kind: repo.UNDO_EVENT_KIND,
      labId: row.event.labId,
      entity: row.event.entity,
      entityId: row.event.entityId,
      details: {
        adjustmentId: id,
        adjustment: details.adjustment,
        controlLotId: details.controlLotId,
        analyteId: details.analyteId,
        period: details.period ?? null,
        description: `Undid: ${details.description}`,
        reason: reason ?? null,
      },
    });
    const targets =
      details.adjustment === 'exclude'
        ? await repo.dataTargets(tx, details.controlLotId, details.analyteId, {
            period: details.period ?? undefined,
            levels: details.level == null ? undefined : [details.level],
          })
        : await repo.dataTargets(tx, details.controlLotId, details.analyteId);
    await requestPeerStatistics(tx, targets);
  });
  await drainPeerStatisticsRequests(db, { minLabs: minLabs() });
  const [adjustment] = await loadAdjustments(db, { id });
  return adjustment;
}
