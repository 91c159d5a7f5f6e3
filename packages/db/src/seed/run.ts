/**
 * Seeds the demo network into the database at DATABASE_URL when it is empty, then prints the demo
 * accounts. Applies no migrations: run `npm run db:migrate` first.
 */
import { fileURLToPath } from 'node:url';
import { sql } from 'drizzle-orm';
import { createDb } from '../client.ts';
import { DEFAULT_DEMO_PASSWORD, isDatabaseEmpty, seedDemoNetwork } from './index.ts';
import { recomputeAllPeerStatistics } from '../queries/peer-statistics.ts';
import { publishPeriodsWithoutSnapshot } from '../queries/publishing.ts';
import { formatDemoAccountLines } from './accounts.ts';

function formatDemoAccounts(): string {
  // Never echo a password someone chose: name the variable instead.
  const password = process.env.DEMO_PASSWORD ? '(the value of DEMO_PASSWORD)' : DEFAULT_DEMO_PASSWORD;
  return [
    `Demo accounts (password: ${password}):`,
    ...formatDemoAccountLines().map((line) => `  ${line}`),
  ].join('\n');
}

/**
 * The seed marks past months published without snapshots: compute the peer statistics and freeze a
 * first version for each such month. Runs again only when a published month still has no snapshot
 * (e.g. a database seeded before snapshots existed), so a restart changes nothing.
 */
async function publishSeededPeriods(
  db: ReturnType<typeof createDb>['db'],
  justSeeded: boolean,
): Promise<void> {
  const pending = await db.execute<{ count: number }>(
    sql`select count(*)::int as count from periods p
        where p.state = 'published' and not exists (select 1 from publications x where x.period = p.period)`,
  );
  if (!justSeeded && pending.rows[0].count === 0) return;
  const targets = await recomputeAllPeerStatistics(db);
  const published = await publishPeriodsWithoutSnapshot(db, { actorLabel: 'demo seed' });
  console.log(
    `Peer statistics computed for ${targets} lot, analyte, level and period combinations; ` +
      `snapshots published for ${published.length ? published.join(', ') : 'no period'}.`,
  );
}

async function main(): Promise<number> {
  const { db, pool } = createDb();
  try {
    let empty: boolean;
    try {
      empty = await isDatabaseEmpty(db);
    } catch (error) {
      // Drizzle wraps the driver's error; its cause says what is wrong (e.g. 'relation "labs" does not exist').
      const cause = error instanceof Error && error.cause instanceof Error ? error.cause : error;
      const reason = cause instanceof Error ? cause.message : String(cause);
      console.error(`Cannot read the database at DATABASE_URL (${reason}). Are the migrations applied?`);
      return 1;
    }
    if (!empty) {
      console.log('The database already holds data: demo seed skipped.');
    } else {
      const started = Date.now();
      const summary = await seedDemoNetwork(db);
      const seconds = ((Date.now() - started) / 1000).toFixed(1);
      console.log(
        `Seeded ${summary.networkName}: ${summary.labs} labs, ${summary.procedures} procedures, ` +
          `${summary.qcSummaries} QC summaries, ${summary.qcValues} daily QC values, ${summary.users} accounts (${seconds} s).`,
      );
    }
    await publishSeededPeriods(db, empty);
    console.log(formatDemoAccounts());
    return 0;
  } finally {
    await pool.end();
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  process.exitCode = await main();
}
