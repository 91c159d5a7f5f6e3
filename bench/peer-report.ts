// Benchmark of the peer report at two network sizes, against a baseline measured in the same run.
// Run with `npm run bench:report` (PostgreSQL at DATABASE_URL and Redis at REDIS_URL must be running).
//
//   Network: the invented demo network (14 labs, six months of summaries), its labs cloned with jittered
//   means until the network has --small and then --large labs, peer statistics recomputed and the past
//   months published (so both a published snapshot and provisional figures are read).
//   Measure: one lab's report, one request at a time over HTTP (the API in this process), for a
//   published month and the open month; the cost per request is compared with `GET /api/health`.
//   Targets: the report's cost per request at --large labs close to that at --small labs (ratio ≈ 1).
//
// Options: --small=50 --large=500 --requests=200
import { performance } from 'node:perf_hooks';
import type { AddressInfo } from 'node:net';
import { sql } from 'drizzle-orm';
import { publishPeriodsWithoutSnapshot, recomputeAllPeerStatistics } from '@plumbline/db';
import { DEMO_PAST_PERIODS, seedDemoNetwork } from '@plumbline/db/seed';
import { createTestApp } from '../apps/api/src/testing/test-app.ts';

const args = new Map(process.argv.slice(2).map((a) => a.replace(/^--/, '').split('=') as [string, string]));
const SIZES = [Number(args.get('small') ?? 50), Number(args.get('large') ?? 500)];
const REQUESTS = Number(args.get('requests') ?? 200);
// The demo's last past month is still open; the one before it is published.
const OPEN = DEMO_PAST_PERIODS.at(-1)!;
const PUBLISHED = DEMO_PAST_PERIODS.at(-2)!;
const log = (message: string) => console.log(`bench:report: ${message}`);

type Figures = { labs: number; healthMs: number; publishedMs: number; openMs: number };

/** Mean milliseconds per request, one request at a time, after a short warm-up. */
async function costPerRequest(url: string, auth: string): Promise<number> {
  const get = async () => {
    const res = await fetch(url, { headers: { authorization: auth } });
    if (res.status !== 200) throw new Error(`${url} answered ${res.status}: ${await res.text()}`);
    await res.arrayBuffer();
  };
  for (let i = 0; i < 20; i++) await get();
  const started = performance.now();
  for (let i = 0; i < REQUESTS; i++) await get();
  return (performance.now() - started) / REQUESTS;
}

async function measure(size: number): Promise<Figures> {
  const t = await createTestApp(`benchreport${size}`);
  const server = t.app.listen(0);
  try {
    const t0 = performance.now();
    await seedDemoNetwork(t.db, { password: 'bench-password-not-used' });
    await cloneLabs(t.db, size);
    await recomputeAllPeerStatistics(t.db);
    await publishPeriodsWithoutSnapshot(t.db, { actorLabel: 'bench' });
    await t.db.execute(sql`analyze`);
    const counts = await t.db.execute<{ labs: number; summaries: number; statistics: number }>(sql`
      select (select count(*)::int from labs) as labs, (select count(*)::int from qc_summaries) as summaries,
             (select count(*)::int from peer_statistics) as statistics`);
    const c = counts.rows[0];
    log(
      `${c.labs} labs: ${c.summaries} summaries, ${c.statistics} peer statistics rows, seeded in ` +
        `${Math.round(performance.now() - t0)} ms`,
    );
    // The demo lab with the most rows in the open month is the one whose report is read.
    const lab = await t.db.execute<{ id: string }>(sql`
      select lab_id as id from qc_summaries where period = ${OPEN}
       group by lab_id order by count(*) desc, lab_id limit 1`);
    const user = await t.makeUser('coordinator', null);
    const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api`;
    const report = (period: string) => `${base}/labs/${lab.rows[0].id}/peer-report?period=${period}`;
    if (args.has('explain')) await explain(t.db, lab.rows[0].id);
    const healthMs = await costPerRequest(`${base}/health`, user.auth);
    const publishedMs = await costPerRequest(report(PUBLISHED), user.auth);
    const openMs = await costPerRequest(report(OPEN), user.auth);
    return { labs: c.labs, healthMs, publishedMs, openMs };
  } finally {
    server.close();
    await t.close();
  }
}

/** Prints the plan of the published-snapshot lookup of the report (with --explain). */
async function explain(db: Awaited<ReturnType<typeof createTestApp>>['db'], labId: string) {
  const plan = await db.execute<{ 'QUERY PLAN': string }>(sql`
    explain (analyze, buffers)
    select ps.id, p.procedure_id
      from published_statistics_members p
      join peer_statistics ps on ps.id = p.peer_statistics_id
      join peer_groups g on g.id = ps.peer_group_id
     where p.procedure_id = any(array(select procedure_id from qc_summaries where lab_id = ${labId} and period = ${PUBLISHED}))
       and g.control_lot_id in (select control_lot_id from qc_summaries where lab_id = ${labId} and period = ${PUBLISHED})
       and ps.period = ${PUBLISHED} and ps.version = 1`);
  for (const row of plan.rows) console.log(`  ${row['QUERY PLAN']}`);
}

/** Copies the seeded labs (procedures and summaries, means jittered by up to ±1 %) until there are `size` labs. */
async function cloneLabs(db: Awaited<ReturnType<typeof createTestApp>>['db'], size: number) {
  await db.transaction(async (tx) => {
    await tx.execute(sql`
      create temp table lab_copies on commit drop as
      select l.id as source, gen_random_uuid() as id, l.code || '-' || k as code, l.name || ' ' || k as name
        from labs l cross join generate_series(1, 1000) k
       order by k, l.code
       limit greatest(${size} - (select count(*) from labs), 0)`);
    await tx.execute(sql`insert into labs (id, code, name) select id, code, name from lab_copies`);
    await tx.execute(sql`
      create temp table procedure_copies on commit drop as
      select p.id as source, gen_random_uuid() as id, c.id as lab_id
        from lab_copies c join procedures p on p.lab_id = c.source`);
    await tx.execute(sql`
      insert into procedures (id, lab_id, code, analyte_id, instrument_model_id, method_id, reagent_id, unit)
      select pc.id, pc.lab_id, p.code, p.analyte_id, p.instrument_model_id, p.method_id, p.reagent_id, p.unit
        from procedure_copies pc join procedures p on p.id = pc.source`);
    await tx.execute(sql`
      insert into qc_summaries (lab_id, procedure_id, control_lot_id, level, period, n, mean, sd, source, late)
      select pc.lab_id, pc.id, s.control_lot_id, s.level, s.period, s.n,
             s.mean * (1 + 0.02 * (random() - 0.5)), s.sd, s.source, s.late
        from procedure_copies pc join qc_summaries s on s.procedure_id = pc.source`);
  });
}

const figures: Figures[] = [];
for (const size of SIZES) figures.push(await measure(size));

const ratio = (x: number) => x.toFixed(2);
console.log('');
console.log(
  '| labs | health ms | report ms (published) | ratio to health | report ms (open) | ratio to health |',
);
console.log('|---:|---:|---:|---:|---:|---:|');
for (const f of figures) {
  console.log(
    `| ${f.labs} | ${f.healthMs.toFixed(2)} | ${f.publishedMs.toFixed(2)} | ${ratio(f.publishedMs / f.healthMs)} | ` +
      `${f.openMs.toFixed(2)} | ${ratio(f.openMs / f.healthMs)} |`,
  );
}
const [small, large] = figures;
// Each size's cost is first divided by its own health cost, so drift of the machine between the two cancels.
const growth = (pick: (f: Figures) => number) =>
  pick(large) / large.healthMs / (pick(small) / small.healthMs);
console.log('');
console.log(
  `Cost per report at ${large.labs} labs ÷ at ${small.labs} labs (each relative to health): ` +
    `published ${ratio(growth((f) => f.publishedMs))}, open ${ratio(growth((f) => f.openMs))} (target close to 1).`,
);
