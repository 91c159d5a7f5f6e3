import { Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import {
  REFERENCE_INTERVAL_CAUTION,
  STUDY_QUEUE_NAME,
  studyPartitioningSchema,
  studySelectionSchema,
  type StudyDetail,
  type StudyInput,
  type StudyJob,
  type StudyResult,
  type StudySelection,
  type StudySummary,
} from '@plumbline/contracts';
import { countPatientResults, recordAudit } from '@plumbline/db';
import type { AppDeps } from '../../deps.ts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { assertLabAccess, labScope } from '../../auth/authenticate.ts';
import { conflict, forbidden, notFound } from '../../errors/app-error.ts';
import * as repo from './reference-intervals.repository.ts';

type Deps = Pick<AppDeps, 'db' | 'redis' | 'env'>;

export const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

// One queue handle per Redis connection, made on first use.
const queues = new WeakMap<Redis, Queue<StudyJob>>();
async function enqueueStudy(deps: Deps, studyId: string): Promise<void> {
  let queue = queues.get(deps.redis);
  if (!queue) {
    queue = new Queue<StudyJob>(STUDY_QUEUE_NAME, { connection: deps.redis, prefix: deps.env.QUEUE_PREFIX });
    queues.set(deps.redis, queue);
  }
  // The study row stays 'queued' when Redis is away; the worker re-enqueues queued studies at start.
  await queue
    .add(
      'study',
      { studyId },
      { jobId: `study-${studyId}-${Date.now()}`, removeOnComplete: true, removeOnFail: true },
    )
    .catch((error: Error) => console.warn(`api: could not enqueue study ${studyId} now (${error.message})`));
}

/** The lab a supervisor acts for: their own lab; a coordinator must name one. */
export function actingLab(principal: Principal, requested: string | undefined): string {
  if (principal.role === 'coordinator') {
    if (!requested) throw forbidden('A coordinator acts for a lab: give its id as "labId".');
    return requested;
  }
  if (!principal.labId) throw forbidden('Your account belongs to no lab.');
  if (requested && requested !== principal.labId) throw notFound('Lab');
  return principal.labId;
}

export function requireSupervisor(principal: Principal, what: string): void {
  if (principal.kind !== 'user' || (principal.role !== 'supervisor' && principal.role !== 'coordinator'))
    throw forbidden(`Only the lab's supervisor can ${what}.`);
}

function toSummary(row: repo.StudyRow): StudySummary {
  return {
    id: row.id,
    labId: row.labId,
    name: row.name,
    analyte: row.analyte,
    selection: studySelectionSchema.parse(row.selection),
    partitioning: studyPartitioningSchema.parse(row.partitioning),
    method: row.method as StudySummary['method'],
    screening: row.screening as StudySummary['screening'],
    status: row.status as StudySummary['status'],
    progress: row.progress,
    failureMessage: row.failureMessage,
    createdAt: row.createdAt.toISOString(),
    latestVersion: row.latestVersion,
    approvedVersion: row.approvedVersion,
  };
}

export function toResult(row: repo.ResultRow): StudyResult {
  return {
    id: row.id,
    version: row.version,
    computedAt: new Date(row.computedAt).toISOString(),
    unit: row.result.unit,
    partitions: row.result.partitions as StudyResult['partitions'],
    advice: row.result.advice as StudyResult['advice'],
    approval: row.approvedAt
      ? {
          approvedAt: new Date(row.approvedAt).toISOString(),
          approvedBy: row.approverName ?? '',
          statement: row.approvalStatement ?? '',
        }
      : null,
  };
}

export async function visibleStudy(deps: Deps, principal: Principal, id: string): Promise<repo.StudyRow> {
  const row = UUID.test(id) ? await repo.findStudy(deps.db, id) : null;
  if (!row) throw notFound('Study');
  assertLabAccess(principal, row.labId, 'Study');
  return row;
}

export async function listStudies(deps: Deps, principal: Principal, labId?: string): Promise<StudySummary[]> {
  const scope = labScope(principal, labId);
  if (principal.role !== 'coordinator' && !scope) return [];
  return (await repo.listStudies(deps.db, scope)).map(toSummary);
}

export async function getStudy(deps: Deps, principal: Principal, id: string): Promise<StudyDetail> {
  const row = await visibleStudy(deps, principal, id);
  const results = await repo.listResults(deps.db, row.id);
  return { ...toSummary(row), results: results.map(toResult), caution: REFERENCE_INTERVAL_CAUTION };
}

export async function countMatching(
  deps: Deps,
  principal: Principal,
  input: { analyteId: string; labId?: string; selection: StudySelection },
): Promise<{ count: number }> {
  const labId = labScope(principal, input.labId);
  if (!labId) throw notFound('Lab');
  return { count: await countPatientResults(deps.db, labId, input.analyteId, input.selection) };
}

export async function createStudy(
  deps: Deps,
  principal: Principal,
  input: StudyInput,
): Promise<StudySummary> {
  requireSupervisor(principal, 'create a study');
  const labId = actingLab(principal, input.labId);
  if (!(await repo.findAnalyte(deps.db, input.analyteId))) throw notFound('Analyte');
  const id = await deps.db.transaction(async (tx) => {
    const studyId = await repo.insertStudy(tx, {
      labId,
      analyteId: input.analyteId,
      name: input.name,
      selection: input.selection,
      partitioning: input.partitioning,
      method: input.method,
      screening: input.screening,
      createdBy: actorOf(principal).actorId,
    });
    await recordAudit(tx, {
      kind: 'ri-study.created',
      ...actorOf(principal),
      labId,
      entity: 'ri-study',
      entityId: studyId,
      details: { name: input.name, method: input.method, screening: input.screening },
    });
    return studyId;
  });
  await enqueueStudy(deps, id);
  return toSummary((await repo.findStudy(deps.db, id))!);
}

export async function rerunStudy(deps: Deps, principal: Principal, id: string): Promise<StudySummary> {
  const row = await visibleStudy(deps, principal, id);
  requireSupervisor(principal, 'run a study');
  if (!(await repo.requeueStudy(deps.db, row.id))) throw conflict(`The study is already ${row.status}.`);
  await enqueueStudy(deps, row.id);
  return toSummary((await repo.findStudy(deps.db, row.id))!);
}

export async function approveStudyResult(
  deps: Deps,
  principal: Principal,
  studyId: string,
  version: number,
  statement: string,
): Promise<StudyResult> {
  const row = await visibleStudy(deps, principal, studyId);
  requireSupervisor(principal, 'approve a study result');
  const result = (await repo.listResults(deps.db, row.id)).find((r) => r.version === version);
  if (!result) throw notFound('Study result');
  if (result.approvedAt)
    throw conflict(`Version ${version} is already approved; an approved result is never changed.`);
  await deps.db.transaction(async (tx) => {
    if (!(await repo.approveResult(tx, result.id, actorOf(principal).actorId!, statement)))
      throw conflict('The result was approved meanwhile.');
    await recordAudit(tx, {
      kind: 'ri-study.approved',
      ...actorOf(principal),
      labId: row.labId,
      entity: 'ri-study',
      entityId: row.id,
      details: { version, statement },
    });
  });
  return toResult((await repo.findResult(deps.db, result.id))!);
}
