import { sql } from 'drizzle-orm';
import type { Executor } from '@plumbline/db';

export type AnalyteRef = { id: string; code: string; name: string; unit: string };

export type StudyRow = {
  id: string;
  labId: string;
  name: string;
  analyte: AnalyteRef;
  selection: unknown;
  partitioning: unknown;
  method: string;
  screening: string;
  status: string;
  progress: number;
  failureMessage: string | null;
  createdAt: Date;
  latestVersion: number | null;
  approvedVersion: number | null;
};

const studySelect = sql`
  select s.id, s.lab_id as "labId", s.name, json_build_object('id', a.id, 'code', a.code, 'name', a.name, 'unit', a.unit) as analyte,
         s.selection, s.partitioning, s.method, s.screening, s.status, s.progress, s.failure_message as "failureMessage",
         s.created_at as "createdAt",
         (select max(version) from ri_study_results r where r.study_id = s.id) as "latestVersion",
         (select max(version) from ri_study_results r where r.study_id = s.id and r.approved_at is not null) as "approvedVersion"
    from ri_studies s join analytes a on a.id = s.analyte_id`;

export async function findAnalyte(db: Executor, id: string): Promise<AnalyteRef | null> {
  const r = await db.execute<AnalyteRef>(sql`select id, code, name, unit from analytes where id = ${id}`);
  return r.rows[0] ?? null;
}

export async function listStudies(db: Executor, labId: string | null): Promise<StudyRow[]> {
  const r = await db.execute<StudyRow>(
    sql`${studySelect} ${labId ? sql`where s.lab_id = ${labId}` : sql``} order by s.created_at desc limit 500`,
  );
  return r.rows.map(withDate);
}

export async function findStudy(db: Executor, id: string): Promise<StudyRow | null> {
  const r = await db.execute<StudyRow>(sql`${studySelect} where s.id = ${id}`);
  return r.rows[0] ? withDate(r.rows[0]) : null;
}

const withDate = <T extends { createdAt: Date | string }>(row: T): T => ({
  ...row,
  createdAt: new Date(row.createdAt),
});

export async function insertStudy(
  db: Executor,
  values: {
    labId: string;
    analyteId: string;
    name: string;
    selection: unknown;
    partitioning: unknown;
    method: string;
    screening: string;
    createdBy: string | null;
  },
): Promise<string> {
  const r = await db.execute<{ id: string }>(sql`
    insert into ri_studies (lab_id, analyte_id, name, selection, partitioning, method, screening, status, created_by)
    values (${values.labId}, ${values.analyteId}, ${values.name}, ${JSON.stringify(values.selection)}::jsonb,
            ${JSON.stringify(values.partitioning)}::jsonb, ${values.method}, ${values.screening}, 'queued', ${values.createdBy})
    returning id`);
  return r.rows[0].id;
}

/** done/failed/draft → queued; false while it is already queued or running. */
export async function requeueStudy(db: Executor, id: string): Promise<boolean> {
  const r = await db.execute(sql`
    update ri_studies set status = 'queued', progress = 0, failure_message = null, updated_at = now()
     where id = ${id} and status in ('draft', 'done', 'failed')`);
  return r.rowCount === 1;
}

export type ResultRow = {
  id: string;
  studyId: string;
  version: number;
  result: { unit: string; partitions: unknown[]; advice: unknown[] };
  computedAt: Date;
  approvedAt: Date | null;
  approverName: string | null;
  approvalStatement: string | null;
};

const resultSelect = sql`
  select r.id, r.study_id as "studyId", r.version, r.result, r.computed_at as "computedAt", r.approved_at as "approvedAt",
         u.name as "approverName", r.approval_statement as "approvalStatement"
    from ri_study_results r left join users u on u.id = r.approved_by`;

export async function listResults(db: Executor, studyId: string): Promise<ResultRow[]> {
  const r = await db.execute<ResultRow>(
    sql`${resultSelect} where r.study_id = ${studyId} order by r.version desc`,
  );
  return r.rows;
}

export async function findResult(db: Executor, id: string): Promise<ResultRow | null> {
  const r = await db.execute<ResultRow>(sql`${resultSelect} where r.id = ${id}`);
  return r.rows[0] ?? null;
}

/** Approval is set once; an approved version is never changed. */
export async function approveResult(
  db: Executor,
  id: string,
  userId: string,
  statement: string,
): Promise<boolean> {
  const r = await db.execute(sql`
    update ri_study_results set approved_at = now(), approved_by = ${userId}, approval_statement = ${statement}
     where id = ${id} and approved_at is null`);
  return r.rowCount === 1;
}

export type CurrentIntervalRow = {
  id: string;
  labId: string;
  analyte: AnalyteRef;
  sex: string;
  ageLow: number;
  ageHigh: number;
  lower: number;
  upper: number;
  source: string;
  adoptedStudyId: string | null;
  adoptedVersion: number | null;
  updatedAt: Date;
};

const currentSelect = sql`
  select c.id, c.lab_id as "labId", json_build_object('id', a.id, 'code', a.code, 'name', a.name, 'unit', a.unit) as analyte,
         c.sex, c.age_low as "ageLow", c.age_high as "ageHigh", c.lower, c.upper, c.source,
         r.study_id as "adoptedStudyId", r.version as "adoptedVersion", c.updated_at as "updatedAt"
    from current_intervals c join analytes a on a.id = c.analyte_id
    left join ri_study_results r on r.id = c.adopted_from_result_id`;

export async function listCurrentIntervals(
  db: Executor,
  labId: string | null,
): Promise<CurrentIntervalRow[]> {
  const r = await db.execute<CurrentIntervalRow>(
    sql`${currentSelect} ${labId ? sql`where c.lab_id = ${labId}` : sql``} order by a.code, c.sex, c.age_low`,
  );
  return r.rows;
}

export async function findCurrentInterval(db: Executor, id: string): Promise<CurrentIntervalRow | null> {
  const r = await db.execute<CurrentIntervalRow>(sql`${currentSelect} where c.id = ${id}`);
  return r.rows[0] ?? null;
}

/** Inserts or replaces the lab's interval for an analyte and partition; returns its id. */
export async function upsertCurrentInterval(
  db: Executor,
  v: {
    labId: string;
    analyteId: string;
    sex: string;
    ageLow: number;
    ageHigh: number;
    lower: number;
    upper: number;
    source: string;
    adoptedFromResultId: string | null;
    updatedBy: string | null;
  },
): Promise<string> {
  const r = await db.execute<{ id: string }>(sql`
    insert into current_intervals (lab_id, analyte_id, sex, age_low, age_high, lower, upper, source, adopted_from_result_id, updated_by)
    values (${v.labId}, ${v.analyteId}, ${v.sex}, ${v.ageLow}, ${v.ageHigh}, ${v.lower}, ${v.upper}, ${v.source},
            ${v.adoptedFromResultId}, ${v.updatedBy})
    on conflict (lab_id, analyte_id, sex, age_low, age_high) do update
      set lower = excluded.lower, upper = excluded.upper, source = excluded.source,
          adopted_from_result_id = excluded.adopted_from_result_id, updated_by = excluded.updated_by, updated_at = now()
    returning id`);
  return r.rows[0].id;
}

export type VerificationRow = {
  id: string;
  labId: string;
  analyte: AnalyteRef;
  interval: { sex: string; ageLow: number; ageHigh: number; lower: number; upper: number; source: string };
  rounds: { values: number[]; outside: number; accepted: boolean }[];
  accepted: boolean;
  createdAt: Date;
  approvedAt: Date | null;
  approverName: string | null;
  approvalStatement: string | null;
};

const verificationSelect = sql`
  select v.id, v.lab_id as "labId", json_build_object('id', a.id, 'code', a.code, 'name', a.name, 'unit', a.unit) as analyte,
         v.interval, v.rounds, v.accepted, v.created_at as "createdAt", v.approved_at as "approvedAt",
         u.name as "approverName", v.approval_statement as "approvalStatement"
    from interval_verifications v join analytes a on a.id = v.analyte_id left join users u on u.id = v.approved_by`;

export async function listVerifications(db: Executor, labId: string | null): Promise<VerificationRow[]> {
  const r = await db.execute<VerificationRow>(
    sql`${verificationSelect} ${labId ? sql`where v.lab_id = ${labId}` : sql``} order by v.created_at desc limit 500`,
  );
  return r.rows;
}

export async function findVerification(db: Executor, id: string): Promise<VerificationRow | null> {
  const r = await db.execute<VerificationRow>(sql`${verificationSelect} where v.id = ${id}`);
  return r.rows[0] ?? null;
}

export async function insertVerification(
  db: Executor,
  v: {
    labId: string;
    analyteId: string;
    interval: unknown;
    rounds: unknown;
    accepted: boolean;
    createdBy: string | null;
  },
): Promise<string> {
  const r = await db.execute<{ id: string }>(sql`
    insert into interval_verifications (lab_id, analyte_id, interval, rounds, accepted, created_by)
    values (${v.labId}, ${v.analyteId}, ${JSON.stringify(v.interval)}::jsonb, ${JSON.stringify(v.rounds)}::jsonb, ${v.accepted}, ${v.createdBy})
    returning id`);
  return r.rows[0].id;
}

export async function updateVerificationRounds(
  db: Executor,
  id: string,
  rounds: unknown,
  accepted: boolean,
): Promise<void> {
  await db.execute(
    sql`update interval_verifications set rounds = ${JSON.stringify(rounds)}::jsonb, accepted = ${accepted} where id = ${id}`,
  );
}

export async function approveVerification(
  db: Executor,
  id: string,
  userId: string,
  statement: string,
): Promise<boolean> {
  const r = await db.execute(sql`
    update interval_verifications set approved_at = now(), approved_by = ${userId}, approval_statement = ${statement}
     where id = ${id} and approved_at is null`);
  return r.rowCount === 1;
}
