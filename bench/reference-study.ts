// Benchmark of a reference-interval study, against a baseline measured in the same run.
// Run with `npm run bench:ri` (PostgreSQL at DATABASE_URL and Redis at REDIS_URL must be running).
//
//   Pipeline: 1,000,000 stored patient results of one analyte (invented: both sexes, adults) are read
//   by a study with two partitions (women, men), run end to end as a BullMQ job by a worker process:
//   read from PostgreSQL (repeats of a sample key dropped; ingest has marked the unique keys), Tukey screening after Box-Cox, nonparametric
//   limits with 90 % CIs, histogram, Harris & Boyd, result stored as a new version.
//   The clock runs from enqueueing the job to the study being 'done'.
//   Baseline: sorting the same 1,000,000 values, already in memory, as a Float64Array.
//   Targets: ratio ≤ 3.0; the worker's peak resident memory ≤ 512 MB.
//
// Options: --rows=1000000 --keep (keep the scratch database).
import { randomBytes } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { Queue } from 'bullmq';
import { Redis } from 'ioredis';
import { sql } from 'drizzle-orm';
import { STUDY_QUEUE_NAME } from '@plumbline/contracts';
import { markUniqueSamples } from '@plumbline/db';
import { createScratchDatabase } from '@plumbline/db/testing';
import { spawnWorkerFor } from '../apps/api/src/testing/worker-process.ts';

const args = new Map(process.argv.slice(2).map((a) => a.replace(/^--/, '').split('=') as [string, string]));
const ROWS = Number(args.get('rows') ?? 1_000_000);
const REDIS_URL = process.env.REDIS_URL ?? 'redis://127.0.0.1:63790';
const log = (message: string) => console.log(`bench:ri: ${message}`);

const scratch = await createScratchDatabase('benchri');
const storageDir = mkdtempSync(join(tmpdir(), 'plumbline-bench-ri-'));
const queuePrefix = `plumbline-bench-ri-${randomBytes(4).toString('hex')}`;
const redis = new Redis(REDIS_URL, { maxRetriesPerRequest: null });
let worker: Awaited<ReturnType<typeof spawnWorkerFor>> | null = null;
try {
  const db = scratch.db;
  const ids = await db.execute<{ lab: string; analyte: string; upload: string }>(sql`
    with lab as (insert into labs (code, name) values ('BENCH', 'Bench lab') returning id),
         analyte as (insert into analytes (code, name, unit) values ('NA-BENCH', 'Sodium', 'mmol/L') returning id),
         upload as (insert into uploads (lab_id, kind, filename, size, sha256, storage_key, status)
                    select id, 'patient-results', 'bench.csv', 0, 'bench', 'none', 'stored' from lab returning id)
    select (select id from lab) as lab, (select id from analyte) as analyte, (select id from upload) as upload`);
  const { lab, analyte, upload } = ids.rows[0];
  const t0 = performance.now();
  // Normal-ish values (sum of three uniforms) around 140 with a 10 % pathological share, one sample key each.
  await db.execute(sql`
    insert into patient_results (lab_id, upload_id, analyte_id, value, sex, age_years, collected_month, setting, sample_hash,
                                 sample_unique)
    select ${lab}, ${upload}, ${analyte},
           round((case when random() < 0.9 then 140 + 2 * (random() + random() + random() - 1.5) * 2
                       else 125 + 30 * random() end)::numeric, 1)::float8,
           case when g % 2 = 0 then 'female' else 'male' end, 18 + g % 60, '2026-01', 'outpatient', md5(g::text), true
      from generate_series(1, ${ROWS}) g`);
  // As ingest does: rows stored with sample_unique true, then every repeated key unmarked.
  await markUniqueSamples(db, lab, upload);
  await db.execute(sql`vacuum analyze patient_results`);
  log(`stored ${ROWS.toLocaleString('en')} results in ${Math.round(performance.now() - t0)} ms`);

  const study = await db.execute<{ id: string }>(sql`
    insert into ri_studies (lab_id, analyte_id, name, selection, partitioning, method, screening, status)
    values (${lab}, ${analyte}, 'Bench study', '{"ageLow":18,"ageHigh":120,"sex":"all"}'::jsonb,
            '{"bySex":true,"ageBands":[]}'::jsonb, 'nonparametric', 'tukey', 'draft') returning id`);
  const studyId = study.rows[0].id;

  worker = await spawnWorkerFor({ databaseUrl: scratch.url, storageDir, queuePrefix, env: { REDIS_URL } });
  const queue = new Queue(STUDY_QUEUE_NAME, { connection: redis, prefix: queuePrefix });
  await db.execute(sql`update ri_studies set status = 'queued' where id = ${studyId}`);
  const started = performance.now();
  await queue.add('study', { studyId }, { jobId: `bench-${studyId}` });
  let status = 'queued';
  while (status !== 'done' && status !== 'failed') {
    await new Promise((r) => setTimeout(r, 20));
    status = (await db.execute<{ status: string }>(sql`select status from ri_studies where id = ${studyId}`))
      .rows[0].status;
  }
  const studyMs = performance.now() - started;
  if (status === 'failed') throw new Error(`the study failed:\n${worker.output()}`);
  const peakKb = Number(
    /VmHWM:\s+(\d+)/.exec(readFileSync(`/proc/${worker.child.pid}/status`, 'utf8'))?.[1] ?? 0,
  );
  await queue.close();

  // Baseline: the same values, in memory, sorted.
  const text = (
    await db.execute<{ v: string }>(sql`select string_agg(value::text, ',') as v from patient_results`)
  ).rows[0].v;
  const values = Float64Array.from(text.split(','), Number);
  const b0 = performance.now();
  values.sort();
  const sortMs = performance.now() - b0;

  log(
    `study (2 partitions, ${ROWS.toLocaleString('en')} results, through the job): ${studyMs.toFixed(0)} ms`,
  );
  log(`baseline (sort ${values.length.toLocaleString('en')} values in memory): ${sortMs.toFixed(0)} ms`);
  log(`ratio: ${(studyMs / sortMs).toFixed(2)} (target ≤ 3.0)`);
  log(`worker peak RSS: ${(peakKb / 1024).toFixed(0)} MB (target ≤ 512 MB)`);
} finally {
  await worker?.stop();
  redis.disconnect();
  if (!args.has('keep')) await scratch.drop();
  rmSync(storageDir, { recursive: true, force: true });
}
