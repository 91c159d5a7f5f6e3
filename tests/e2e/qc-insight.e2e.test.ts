// The eighth journey through the browser: a supervisor records a reagent-lot change on a procedure,
// uploads a month whose SDI jumps, sees the detected shift annotated with the event, and opens the QC
// plan page. The real API serves the built web app; the real ingest worker runs in this process.
// The worker's own declaration of its untyped unit library: tests/tsconfig does not include apps/worker.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference
/// <reference path="../../apps/worker/src/types/ucum-lhc.d.ts" />
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq, sql } from 'drizzle-orm';
import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import { controlLots, labs, procedures, recomputeAllPeerStatistics, type Database } from '@plumbline/db';
import { startUploadStack } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
const supervisor = demoAccounts.find((a) => a.role === 'supervisor' && a.labCode === 'PL-003')!;
const PERIOD = '2026-12';
// PL-003's December, built from its own November figures: sodium 15 % above them (a jump well beyond
// the peers' spread, so the month stands out whatever the group's size), potassium as in November.
let file = '';

async function decemberFile(db: Database): Promise<string> {
  const rows = await db.execute<{ code: string; level: number; n: number; mean: number; sd: number }>(sql`
    select p.code, s.level, s.n, s.mean, s.sd
    from qc_summaries s join procedures p on p.id = s.procedure_id join labs l on l.id = s.lab_id
    join control_lots c on c.id = s.control_lot_id
    where l.code = 'PL-003' and s.period = '2026-11' and c.lot_number = 'PGC-26187'
      and p.code in ('NA1', 'K1')
    order by p.code desc, s.level`);
  const decimal = (x: number, digits: number) => x.toFixed(digits).replace('.', ',');
  return [
    'Month;Assay code;Lot;Level;N;Mean;SD;Unit',
    ...rows.rows.map((r) => {
      const mean = r.code === 'NA1' ? r.mean * 1.15 : r.mean;
      return `${PERIOD};${r.code};PGC-26187;${r.level};${r.n};${decimal(mean, 2)};${decimal(r.sd, 3)};mmol/L`;
    }),
    '',
  ].join('\n');
}

let server: Awaited<ReturnType<typeof startUploadStack>>;

beforeAll(async () => {
  server = await startUploadStack('e2einsight', async (scratch) => {
    await seedDemoNetwork(scratch.db, { password: PASSWORD });
    // Every other lab has sent December as November, so December has peer figures.
    await scratch.db.execute(sql`
      insert into qc_summaries (lab_id, procedure_id, control_lot_id, level, period, n, mean, sd, source)
      select s.lab_id, s.procedure_id, s.control_lot_id, s.level, ${PERIOD}, s.n, s.mean, s.sd, s.source
      from qc_summaries s join labs l on l.id = s.lab_id
      where s.period = '2026-11' and l.code <> 'PL-003'`);
    await recomputeAllPeerStatistics(scratch.db);
    file = await decemberFile(scratch.db);
  });
});
afterAll(async () => server?.close());

describe.skipIf(!chromiumAvailable())('a shift after a reagent-lot change, and the QC plan', () => {
  it('when a supervisor records a reagent-lot change and uploads a month whose SDI jumps, then the drill-down shows the shift with the event, and the QC plan page opens', async () => {
    const [row] = await server.db
      .select({ procedureId: procedures.id, controlLotId: controlLots.id })
      .from(procedures)
      .innerJoin(labs, eq(labs.id, procedures.labId))
      .innerJoin(controlLots, eq(controlLots.lotNumber, 'PGC-26187'))
      .where(and(eq(labs.code, 'PL-003'), eq(procedures.code, 'NA1')));
    const drilldown = (period: string) =>
      `${server.url}/lab/peer-report/${row.procedureId}/${row.controlLotId}/1?period=${period}`;
    const browser = await launchBrowser();
    try {
      const { page } = browser;
      await page.goto(`${server.url}/sign-in`);
      await page.getByLabel('E-mail address').fill(supervisor.email);
      await page.getByLabel('Password').fill(PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(`${server.url}/lab`);

      // The reagent-lot change, recorded on November's drill-down of sodium level 1.
      await page.goto(drilldown('2026-11'));
      const insight = page.getByTestId('procedure-insight');
      await insight.waitFor({ timeout: 30_000 });
      await insight.getByLabel('Date').fill('2026-12-02');
      await insight.getByLabel('Kind').selectOption('reagent-lot');
      await insight.getByLabel('Note').fill('Reagent lot NX-204 opened');
      await insight.getByRole('button', { name: 'Record event' }).click();
      await page.getByText('Event recorded.').waitFor();

      // December's file.
      await page.getByRole('navigation').first().getByRole('link', { name: 'Uploads' }).click();
      await page.getByRole('heading', { name: 'Uploads', level: 1 }).waitFor();
      await page.getByLabel('Choose a file').setInputFiles({
        name: 'pl003-december.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(file),
      });
      await page.getByRole('heading', { name: 'Match the columns of pl003-december.csv' }).waitFor();
      await page.getByLabel('procedure', { exact: true }).selectOption('Assay code');
      await page.getByRole('button', { name: 'Upload and check the file' }).click();
      await page.getByText('Stored: 4 rows accepted').waitFor({ timeout: 60_000 });

      // December's drill-down: the shift, annotated with the event. The worker recomputes December's peer
      // figures after storing, so the page is reloaded until they are in.
      const shifts = page.getByTestId('detected-shifts');
      // Up to two minutes: under a full test run the recompute waits its turn.
      for (const deadline = Date.now() + 120_000; Date.now() < deadline;) {
        await page.goto(drilldown(PERIOD));
        await page
          .getByText(/No shift detected|SDI shifted/)
          .first()
          .waitFor({ timeout: 60_000 });
        if ((await shifts.count()) > 0) break;
        await page.waitForTimeout(1000);
      }
      const text = await shifts.innerText();
      expect(text).toMatch(/SDI shifted up/);
      expect(text).toContain('Reagent lot change on 2026-12-02 (Reagent lot NX-204 opened)');
      await snap(page, 'insight-1-shift');

      // The QC plan page.
      await page.getByRole('navigation').first().getByRole('link', { name: 'QC plan' }).click();
      await page.getByRole('heading', { name: 'QC plan', level: 1 }).waitFor();
      await page.getByTestId('qc-plan-table').waitFor({ timeout: 60_000 });
      expect(await page.getByTestId('qc-plan-table').innerText()).toContain('NA1');
      await snap(page, 'insight-2-qc-plan');
    } finally {
      await browser.close();
    }
  });
});
