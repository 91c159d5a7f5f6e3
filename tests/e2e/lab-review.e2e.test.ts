// Journey 3 through the browser: the scientist of a lab that reads high on potassium opens the month's
// peer report, filters it to the flagged rows, opens the flagged one, sees its SDI trend, the two-level
// SDI plot and the control chart with its 1-3s rejection, and writes a corrective-action comment; the
// supervisor then signs the month off and downloads the monthly PDF report. The real API serves the
// built web app against a freshly seeded demo network.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { and, eq } from 'drizzle-orm';
import type { Page } from 'playwright-core';
import { seedDemoNetwork, demoAccounts, demoScenarios } from '@plumbline/db/seed';
import {
  controlLots,
  labs,
  procedures,
  qcSummaries,
  qcValues,
  recomputeAllPeerStatistics,
} from '@plumbline/db';
import type { Database } from '@plumbline/db';
import { startServer } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
const { labCode, analyteCode } = demoScenarios.biased; // PL-022 reads high on potassium
const analyst = demoAccounts.find((a) => a.role === 'analyst' && a.labCode === labCode)!;
const supervisor = demoAccounts.find((a) => a.role === 'supervisor' && a.labCode === labCode)!;
const PERIOD = '2026-11';
const LOT = 'PGC-26187';
const COMMENT =
  'Potassium reads high at both levels: electrode recalibrated on 14 November, controls repeated within 1 SD.';
const STATEMENT =
  'November reviewed. The potassium bias was investigated and corrected; no patient results affected.';

/**
 * The demo network has PL-022's November potassium as a monthly summary only. Its analyser middleware
 * also sent the daily level-1 values: twenty runs around the lab's own November mean and SD, the
 * twelfth far above it (+3.8 SD), which the control chart must show as a 1-3s rejection.
 */
async function addDailyValues(db: Database) {
  const [row] = await db
    .select({
      labId: labs.id,
      procedureId: procedures.id,
      controlLotId: controlLots.id,
      mean: qcSummaries.mean,
      sd: qcSummaries.sd,
    })
    .from(qcSummaries)
    .innerJoin(labs, eq(labs.id, qcSummaries.labId))
    .innerJoin(procedures, eq(procedures.id, qcSummaries.procedureId))
    .innerJoin(controlLots, eq(controlLots.id, qcSummaries.controlLotId))
    .where(
      and(
        eq(labs.code, labCode),
        eq(procedures.code, `${analyteCode}-CHEM2`),
        eq(controlLots.lotNumber, LOT),
        eq(qcSummaries.period, PERIOD),
        eq(qcSummaries.level, 1),
      ),
    );
  const offsets = [
    0.3, -0.5, 0.8, -0.2, 0.1, -0.9, 0.4, 0.6, -0.3, 0.2, -0.6, 3.8, -0.4, 0.5, -0.1, 0.7, -0.8, 0.2, 1.1,
    -0.5,
  ];
  await db.insert(qcValues).values(
    offsets.map((z, index) => ({
      labId: row.labId,
      procedureId: row.procedureId,
      controlLotId: row.controlLotId,
      level: 1,
      period: PERIOD,
      measuredAt: new Date(Date.UTC(2026, 10, index + 1, 7, 30)),
      value: Number((row.mean + z * row.sd).toFixed(3)),
      run: `2026-11-${String(index + 1).padStart(2, '0')}-R1`,
    })),
  );
}

let server: Awaited<ReturnType<typeof startServer>>;
let downloadDir: string;

beforeAll(async () => {
  server = await startServer('e2elabreview', async (scratch) => {
    await seedDemoNetwork(scratch.db, { password: PASSWORD });
    await addDailyValues(scratch.db);
    await recomputeAllPeerStatistics(scratch.db);
  });
  downloadDir = mkdtempSync(join(tmpdir(), 'plumbline-e2e-report-'));
});
afterAll(async () => {
  await server?.close();
  if (downloadDir) rmSync(downloadDir, { recursive: true, force: true });
});

async function signIn(page: Page, email: string) {
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail address').fill(email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${server.url}/lab`);
}

async function openReport(page: Page) {
  await page.getByRole('navigation').first().getByRole('link', { name: 'Peer report', exact: true }).click();
  await page.getByRole('combobox', { name: 'Period', exact: true }).selectOption(PERIOD);
  await page.getByRole('table', { name: 'Peer report of November 2026' }).waitFor();
}

const reportRows = (page: Page) =>
  page.getByRole('table', { name: 'Peer report of November 2026' }).locator('tr[data-row-key]');

describe.skipIf(!chromiumAvailable())('reviewing the month through the browser', () => {
  it('when the scientist reviews the flagged result and the supervisor signs the month off, then the comment, sign-off and PDF follow', async () => {
    // The scientist.
    const scientist = await launchBrowser();
    try {
      const { page } = scientist;
      await signIn(page, analyst.email);
      await page
        .getByRole('region', { name: 'Needs attention' })
        .getByText(/action flag/)
        .waitFor();
      await snap(page, 'lab-overview');

      await openReport(page);
      expect(await page.getByTestId('report-status').textContent()).toMatch(/^Provisional/);
      const allRows = await reportRows(page).count();
      expect(allRows).toBeGreaterThan(10);

      // The table as CSV: a header and one line per result.
      const [csv] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('button', { name: 'Report CSV' }).click(),
      ]);
      expect(csv.suggestedFilename()).toMatch(/\.csv$/);
      const csvFile = join(downloadDir, csv.suggestedFilename());
      await csv.saveAs(csvFile);
      const csvLines = readFileSync(csvFile, 'utf8').trim().split(/\r?\n/);
      expect(csvLines.length).toBe(allRows + 1);
      expect(csvLines.some((line) => line.includes(`${analyteCode}-CHEM2`))).toBe(true);

      await page.getByLabel('Flagged rows only (warning or action)').check();
      await expect.poll(() => reportRows(page).count()).toBeLessThan(allRows);
      const flagged = reportRows(page);
      const severities = await flagged.evaluateAll((rows) =>
        rows.map((row) => row.getAttribute('data-severity')),
      );
      expect(severities.length).toBeGreaterThan(0);
      expect(severities.every((s) => s === 'warning' || s === 'action')).toBe(true);
      await snap(page, 'lab-report-flagged');

      // The biased potassium level 1 is among them; open it.
      const potassium = flagged
        .filter({ hasText: 'Potassium' })
        .filter({ has: page.getByRole('cell', { name: '1', exact: true }) })
        .first();
      await potassium.getByRole('link', { name: /^Potassium, .* level 1: open the charts$/ }).click();
      await page.getByRole('heading', { name: 'Potassium, level 1', level: 1 }).waitFor();

      // The SDI trend: one point per month with a figure, the latest one an action.
      const trend = page.getByTestId('trend-chart-sdi');
      await trend.waitFor();
      expect(await trend.locator('[data-period]').count()).toBeGreaterThanOrEqual(3);
      expect(await trend.locator(`[data-period="${PERIOD}"]`).getAttribute('data-severity')).toBe('action');
      // The two-level plot with this lab marked, and only this lab.
      const twoLevel = page.getByTestId('two-level-sdi-plot');
      expect(await twoLevel.locator('[data-own-lab="true"]').count()).toBe(1);
      expect(
        Number(await twoLevel.locator('[data-own-lab="true"]').getAttribute('data-sdi-x')),
      ).toBeGreaterThan(3);
      // The control chart with the twelfth run's 1-3s marked on its point.
      const chart = page.getByTestId('levey-jennings-level-1');
      expect(await chart.locator('[data-value]').count()).toBe(20);
      const rejected = chart.locator('[data-rule-label]');
      expect(await rejected.count()).toBeGreaterThanOrEqual(1);
      expect(await rejected.first().textContent()).toContain('1-3s');
      expect(await chart.locator('[data-rules~="1-3s"]').getAttribute('aria-label')).toContain(
        'run 2026-11-12-R1',
      );
      // Keyboard: the chart's points are reachable and read out.
      await chart.locator('[data-value][tabindex="0"]').focus();
      await page.keyboard.press('End');
      expect(await chart.getByText(/run 2026-11-20-R1/, { exact: false }).count()).toBeGreaterThan(0);
      await snap(page, 'lab-row-details');

      await page.getByLabel('Add a corrective-action comment').fill(COMMENT);
      await page.getByRole('button', { name: 'Save comment' }).click();
      await page.getByRole('list', { name: 'Comments' }).getByText(COMMENT).waitFor();
      // The charts draw under the strict Content Security Policy without any exception.
      expect(scientist.cspViolations).toEqual([]);
    } finally {
      await scientist.close();
    }

    // The supervisor.
    const lead = await launchBrowser();
    try {
      const { page } = lead;
      await signIn(page, supervisor.email);
      await openReport(page);
      // The scientist's comment shows under its row.
      await page.getByRole('table', { name: 'Peer report of November 2026' }).getByText(COMMENT).waitFor();

      await page.getByLabel('Sign-off statement').fill(STATEMENT);
      await page.getByRole('button', { name: 'Sign off November 2026' }).click();
      const dialog = page.getByRole('dialog', { name: 'Sign off November 2026?' });
      await dialog.getByRole('button', { name: 'Sign off', exact: true }).click();
      const signed = page.getByTestId('signoff-signed');
      await signed.waitFor();
      expect(await signed.textContent()).toContain(`Signed off by ${supervisor.name}`);
      expect(await signed.textContent()).toContain(STATEMENT);
      expect(await page.getByLabel('Sign-off statement').count()).toBe(0);
      await snap(page, 'lab-report-signed');

      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('button', { name: 'Monthly report (PDF)' }).click(),
      ]);
      expect(download.suggestedFilename()).toMatch(/\.pdf$/);
      expect(download.suggestedFilename()).toContain(PERIOD);
      const file = join(downloadDir, download.suggestedFilename());
      await download.saveAs(file);
      expect(statSync(file).size).toBeGreaterThan(2000);
      expect(readFileSync(file).subarray(0, 5).toString('latin1')).toBe('%PDF-');
    } finally {
      await lead.close();
    }
  });
});
