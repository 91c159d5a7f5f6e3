import { chromium } from 'playwright-core';
import { and, eq } from 'drizzle-orm';
import { seedDemoNetwork } from '@plumbline/db/seed';
import { controlLots, labs, procedures, qcSummaries, qcValues, recomputeAllPeerStatistics } from '@plumbline/db';
import { startServer } from '../helpers/server.ts';

const server = await startServer('shotslab', async (scratch) => {
  await seedDemoNetwork(scratch.db, { password: 'pw-shots-12345' });
  const [row] = await scratch.db.select({ labId: labs.id, procedureId: procedures.id, controlLotId: controlLots.id, mean: qcSummaries.mean, sd: qcSummaries.sd })
    .from(qcSummaries).innerJoin(labs, eq(labs.id, qcSummaries.labId)).innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId)).innerJoin(controlLots, eq(controlLots.id, qcSummaries.controlLotId))
    .where(and(eq(labs.code, 'PL-022'), eq(procedures.code, 'K-CHEM2'), eq(controlLots.lotNumber, 'PGC-26187'), eq(qcSummaries.period, '2026-11'), eq(qcSummaries.level, 1)));
  const offsets = [0.3, -0.5, 0.8, -0.2, 0.1, -0.9, 0.4, 0.6, -0.3, 0.2, -0.6, 3.8, -0.4, 0.5, -0.1, 0.7, -0.8, 0.2, 1.1, -0.5];
  await scratch.db.insert(qcValues).values(offsets.map((z, i) => ({ labId: row.labId, procedureId: row.procedureId, controlLotId: row.controlLotId, level: 1, period: '2026-11', measuredAt: new Date(Date.UTC(2026, 10, i + 1, 7, 30)), value: Number((row.mean + z * row.sd).toFixed(3)), run: `R${i + 1}` })));
  await recomputeAllPeerStatistics(scratch.db);
});
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox'] });
try {
  const page = await browser.newPage({ viewport: { width: 1366, height: 900 }, deviceScaleFactor: 1 });
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail address').fill(process.env.WHO ?? 'supervisor.pl022@plumbline.example');
  await page.getByLabel('Password').fill('pw-shots-12345');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${server.url}/lab`);
  await page.goto(`${server.url}/lab/peer-report?period=2026-11`);
  await page.getByRole('table', { name: 'Peer report of November 2026' }).waitFor();
  await page.screenshot({ path: '/tmp/lab-shots/x-report.png', fullPage: true });
  await page.locator('tr[data-row-key]').first().screenshot({ path: '/tmp/lab-shots/x-report-row.png' });
  await page.getByRole('link', { name: /^Potassium, .* level 1: open the charts$/ }).first().click();
  await page.getByTestId('levey-jennings-level-1').waitFor();
  for (const id of ['trend-chart-sdi', 'trend-chart-cvr', 'peer-distribution', 'two-level-sdi-plot', 'levey-jennings-level-1', 'uncertainty-chart']) {
    await page.getByTestId(id).screenshot({ path: `/tmp/lab-shots/x-${id}.png` });
  }
  await page.goto(`${server.url}/lab/procedures`);
  await page.getByRole('table').waitFor();
  await page.waitForTimeout(500);
  await page.screenshot({ path: '/tmp/lab-shots/x-procedures.png', fullPage: true });
  await page.getByRole('button', { name: 'Register a procedure' }).click();
  await page.waitForTimeout(800);
  await page.screenshot({ path: '/tmp/lab-shots/x-procedure-dialog.png' });
  await page.keyboard.press('Escape');
  await page.goto(`${server.url}/lab/administration`);
  await page.getByRole('table').first().waitFor();
  await page.waitForTimeout(500);
  await page.screenshot({ path: '/tmp/lab-shots/x-admin.png', fullPage: true });
  await page.getByRole('button', { name: 'Create a token' }).click();
  await page.getByLabel('Name').fill('Analyser middleware, bench 2');
  await page.getByRole('button', { name: 'Create token' }).click();
  await page.getByText('This is the only time the token is shown').waitFor();
  await page.screenshot({ path: '/tmp/lab-shots/x-token.png' });
} finally {
  await browser.close();
  await server.close();
}
