import { verifyInterval } from '@plumbline/stats';
import {
  REFERENCE_INTERVAL_CAUTION,
  type CurrentInterval,
  type CurrentIntervalInput,
  type PartitionResult,
  type Verification,
} from '@plumbline/contracts';
import { recordAudit } from '@plumbline/db';
import type { AppDeps } from '../../deps.ts';
import type { Principal } from '../../auth/principal.ts';
import { actorOf } from '../../auth/principal.ts';
import { assertLabAccess, labScope } from '../../auth/authenticate.ts';
import { badRequest, conflict, notFound } from '../../errors/app-error.ts';
import * as repo from './reference-intervals.repository.ts';
import { UUID, actingLab, requireSupervisor, visibleStudy } from './studies.service.ts';

type Deps = Pick<AppDeps, 'db' | 'redis' | 'env'>;

function toCurrent(row: repo.CurrentIntervalRow): CurrentInterval {
  return {
    id: row.id,
    labId: row.labId,
    analyte: row.analyte,
    sex: row.sex as CurrentInterval['sex'],
    ageLow: row.ageLow,
    ageHigh: row.ageHigh,
    lower: row.lower,
    upper: row.upper,
    source: row.source,
    adoptedFrom:
      row.adoptedStudyId && row.adoptedVersion !== null
        ? { studyId: row.adoptedStudyId, version: row.adoptedVersion }
        : null,
    updatedAt: new Date(row.updatedAt).toISOString(),
  };
}

export async function listCurrentIntervals(deps: Deps, principal: Principal, labId?: string) {
  const scope = labScope(principal, labId);
  if (principal.role !== 'coordinator' && !scope) return [];
  return (await repo.listCurrentIntervals(deps.db, scope)).map(toCurrent);
}

export async function saveCurrentInterval(
  deps: Deps,
  principal: Principal,
  input: CurrentIntervalInput,
): Promise<CurrentInterval> {
  requireSupervisor(principal, 'keep the current intervals');
  const labId = actingLab(principal, input.labId);
  if (!(await repo.findAnalyte(deps.db, input.analyteId))) throw notFound('Analyte');
  const id = await deps.db.transaction(async (tx) => {
    const saved = await repo.upsertCurrentInterval(tx, {
      ...input,
      labId,
      adoptedFromResultId: null,
      updatedBy: actorOf(principal).actorId,
    });
    await recordAudit(tx, {
      kind: 'current-interval.saved',
      ...actorOf(principal),
      labId,
      entity: 'current-interval',
      entityId: saved,
      details: { ...input },
    });
    return saved;
  });
  return toCurrent((await repo.findCurrentInterval(deps.db, id))!);
}

/** Makes one partition of an approved study result the lab's current interval (audited). */
export async function adoptStudyResult(
  deps: Deps,
  principal: Principal,
  input: { resultId: string; partition: string },
): Promise<CurrentInterval> {
  const result = UUID.test(input.resultId) ? await repo.findResult(deps.db, input.resultId) : null;
  if (!result) throw notFound('Study result');
  const study = await visibleStudy(deps, principal, result.studyId);
  requireSupervisor(principal, 'adopt an interval');
  if (!result.approvedAt) throw conflict('Only an approved result can be adopted; approve it first.');
  const partition = (result.result.partitions as PartitionResult[]).find((p) => p.label === input.partition);
  if (!partition) throw notFound('Partition');
  if (!partition.lower || !partition.upper)
    throw badRequest(`The partition "${partition.label}" has no limits to adopt: ${partition.note ?? ''}`);
  const source = `Study "${study.name}", version ${result.version}, approved ${new Date(result.approvedAt).toISOString().slice(0, 10)}`;
  const id = await deps.db.transaction(async (tx) => {
    const saved = await repo.upsertCurrentInterval(tx, {
      labId: study.labId,
      analyteId: study.analyte.id,
      sex: partition.key.sex,
      ageLow: partition.key.ageLow,
      ageHigh: partition.key.ageHigh,
      lower: partition.lower!.value,
      upper: partition.upper!.value,
      source,
      adoptedFromResultId: result.id,
      updatedBy: actorOf(principal).actorId,
    });
    await recordAudit(tx, {
      kind: 'current-interval.adopted',
      ...actorOf(principal),
      labId: study.labId,
      entity: 'current-interval',
      entityId: saved,
      details: { studyId: study.id, version: result.version, partition: partition.label },
    });
    return saved;
  });
  return toCurrent((await repo.findCurrentInterval(deps.db, id))!);
}

const NEXT_STEP = {
  accepted:
    'The transferred interval is verified for this laboratory: no more than 2 of 20 results fall outside it.',
  'collect-more':
    'Not verified: more than 2 of 20 results fall outside. Collect 20 more results from healthy individuals and ' +
    'verify again; if again more than 2 fall outside, derive the interval locally (CLSI EP28-A3c).',
  'derive-locally':
    'Not verified twice: derive the reference interval locally from at least 120 healthy individuals, or ' +
    'review the analytical method and the population (CLSI EP28-A3c).',
} as const;

function toVerification(row: repo.VerificationRow): Verification {
  const last = row.rounds[row.rounds.length - 1];
  const status = last?.accepted ? 'accepted' : row.rounds.length >= 2 ? 'derive-locally' : 'collect-more';
  return {
    id: row.id,
    labId: row.labId,
    analyte: row.analyte,
    interval: row.interval as Verification['interval'],
    rounds: row.rounds,
    status,
    nextStep: NEXT_STEP[status],
    approval: row.approvedAt
      ? {
          approvedAt: new Date(row.approvedAt).toISOString(),
          approvedBy: row.approverName ?? '',
          statement: row.approvalStatement ?? '',
        }
      : null,
    createdAt: new Date(row.createdAt).toISOString(),
    caution: REFERENCE_INTERVAL_CAUTION,
  };
}

async function visibleVerification(deps: Deps, principal: Principal, id: string) {
  const row = UUID.test(id) ? await repo.findVerification(deps.db, id) : null;
  if (!row) throw notFound('Verification');
  assertLabAccess(principal, row.labId, 'Verification');
  return row;
}

export async function listVerifications(deps: Deps, principal: Principal, labId?: string) {
  const scope = labScope(principal, labId);
  if (principal.role !== 'coordinator' && !scope) return [];
  return (await repo.listVerifications(deps.db, scope)).map(toVerification);
}

export async function getVerification(deps: Deps, principal: Principal, id: string) {
  return toVerification(await visibleVerification(deps, principal, id));
}

export async function createVerification(
  deps: Deps,
  principal: Principal,
  input: { labId?: string; currentIntervalId: string; values: number[] },
): Promise<Verification> {
  const labId = actingLab(principal, input.labId);
  const current = UUID.test(input.currentIntervalId)
    ? await repo.findCurrentInterval(deps.db, input.currentIntervalId)
    : null;
  if (!current || current.labId !== labId) throw notFound('Current interval');
  const outcome = verifyInterval(input.values, [current.lower, current.upper]);
  const id = await deps.db.transaction(async (tx) => {
    const created = await repo.insertVerification(tx, {
      labId,
      analyteId: current.analyte.id,
      interval: {
        sex: current.sex,
        ageLow: current.ageLow,
        ageHigh: current.ageHigh,
        lower: current.lower,
        upper: current.upper,
        source: current.source,
      },
      rounds: [{ values: input.values, outside: outcome.outside, accepted: outcome.accepted }],
      accepted: outcome.accepted,
      createdBy: actorOf(principal).actorId,
    });
    await recordAudit(tx, {
      kind: 'verification.created',
      ...actorOf(principal),
      labId,
      entity: 'verification',
      entityId: created,
      details: { outside: outcome.outside, accepted: outcome.accepted },
    });
    return created;
  });
  return getVerification(deps, principal, id);
}

/** The second set of 20 results after a first set that was not accepted. */
export async function addVerificationRound(
  deps: Deps,
  principal: Principal,
  id: string,
  values: number[],
): Promise<Verification> {
  const row = await visibleVerification(deps, principal, id);
  if (row.approvedAt) throw conflict('This verification is approved and can no longer change.');
  if (row.accepted || row.rounds.length >= 2)
    throw conflict('A second set of 20 results is taken only after a first set that was not accepted.');
  const outcome = verifyInterval(values, [row.interval.lower, row.interval.upper]);
  const rounds = [...row.rounds, { values, outside: outcome.outside, accepted: outcome.accepted }];
  await deps.db.transaction(async (tx) => {
    await repo.updateVerificationRounds(tx, row.id, rounds, outcome.accepted);
    await recordAudit(tx, {
      kind: 'verification.round-added',
      ...actorOf(principal),
      labId: row.labId,
      entity: 'verification',
      entityId: row.id,
      details: { outside: outcome.outside, accepted: outcome.accepted },
    });
  });
  return getVerification(deps, principal, id);
}

export async function approveVerification(
  deps: Deps,
  principal: Principal,
  id: string,
  statement: string,
): Promise<Verification> {
  const row = await visibleVerification(deps, principal, id);
  requireSupervisor(principal, 'approve a verification');
  await deps.db.transaction(async (tx) => {
    if (!(await repo.approveVerification(tx, row.id, actorOf(principal).actorId!, statement)))
      throw conflict('This verification is already approved.');
    await recordAudit(tx, {
      kind: 'verification.approved',
      ...actorOf(principal),
      labId: row.labId,
      entity: 'verification',
      entityId: row.id,
      details: { statement },
    });
  });
  return getVerification(deps, principal, id);
}
