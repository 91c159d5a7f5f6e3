// The worker's own declaration of its untyped unit library: tests/tsconfig does not include apps/worker.
// eslint-disable-next-line @typescript-eslint/triple-slash-reference
/// <reference path="../../apps/worker/src/types/ucum-lhc.d.ts" />
// Journey 1 through the browser: an analyst uploads a monthly summary with one bad row, reads the row
// error, discards it, uploads the corrected file, watches the progress bar and sees the month's report
// change. The real API serves the built web app; the real ingest worker runs in this process on Redis.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import type { Page } from 'playwright-core';
import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import { startUploadStack } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
const analyst = demoAccounts.find((a) => a.role === 'analyst' && a.labCode === 'PL-003')!;
// The seeded network's current period: open, and no lab has data for it yet.
const PERIOD = '2026-12';

// The lab's own export: its own header names (one of them, "Assay code", matches no Plumbline column
// by name), semicolons and decimal commas. PL-003's procedure codes are the analyte code + "1".
const header = 'Month;Assay code;Lot;Level;N;Mean;SD;Unit';
const goodRows = [
  `${PERIOD};NA1;PGC-26187;1;30;128,4;1,2;mmol/L`,
  `${PERIOD};NA1;PGC-26187;2;30;151,6;1,3;mmol/L`,
  `${PERIOD};K1;PGC-26187;1;30;3,62;0,05;mmol/L`,
];
const lastGood = `${PERIOD};K1;PGC-26187;2;30;6,21;0,07;mmol/L`;
// Line 5 of the file (the header is line 1): a negative SD.
const lastBad = `${PERIOD};K1;PGC-26187;2;30;6,21;-0,07;mmol/L`;
const badFile = [header, ...goodRows, lastBad, ''].join('\n');
const fixedFile = [header, ...goodRows, lastGood, ''].join('\n');

let server: Awaited<ReturnType<typeof startUploadStack>>;

beforeAll(async () => {
  server = await startUploadStack(
    'e2eupload',
    async (scratch) => {
      await seedDemoNetwork(scratch.db, { password: PASSWORD });
    },
    // Holds the storing transaction open a moment, so the browser can watch the bar move.
    { holdBeforeCommitMs: 1500 },
  );
});
afterAll(async () => server?.close());

async function signIn(page: Page) {
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail address').fill(analyst.email);
  await page.getByLabel('Password').fill(PASSWORD);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${server.url}/lab`);
}

/** Drops a file on the drop zone as a browser does when a file is dragged in from the desktop. */
async function dropFile(page: Page, name: string, content: string) {
  // Runs in the page (the tests compile without the DOM library, hence the text).
  const dataTransfer = await page.evaluateHandle(`(() => {
    const transfer = new DataTransfer();
    transfer.items.add(new File([${JSON.stringify(content)}], ${JSON.stringify(name)}, { type: 'text/csv' }));
    return transfer;
  })()`);
  await page.getByText('Drag your CSV file here').dispatchEvent('drop', { dataTransfer });
}

describe.skipIf(!chromiumAvailable())('uploading a month of control data through the browser', () => {
  it('when the analyst uploads a file with a bad row, discards it and uploads the corrected file, then the period report shows the new results', async () => {
    const browser = await launchBrowser();
    try {
      const { page } = browser;
      await signIn(page);
      await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Uploads' }).click();
      await page.getByRole('heading', { name: 'Uploads', level: 1 }).waitFor();

      // The month's report before: nothing of this lab for the period.
      const report = page.getByRole('region', { name: 'Report for the period' });
      await report.getByLabel('Period').selectOption(PERIOD);
      await report.getByText(/No results of your lab are stored for December 2026 yet/).waitFor();
      await snap(page, 'upload-1-empty');

      // First file, dragged in: its columns are matched by name except "Assay code", chosen by hand.
      await dropFile(page, 'pl003-december.csv', badFile);
      await page.getByRole('heading', { name: 'Match the columns of pl003-december.csv' }).waitFor();
      const procedure = page.getByLabel('procedure', { exact: true });
      expect(await procedure.inputValue()).toBe('');
      expect(await page.getByLabel('mean', { exact: true }).inputValue()).toBe('Mean');
      expect(await page.getByLabel('period', { exact: true }).inputValue()).toBe('Month');
      await procedure.selectOption('Assay code');
      await snap(page, 'upload-2-mapping');
      await page.getByRole('button', { name: 'Upload and check the file' }).click();

      // The worker rejects line 5 and stores nothing until the analyst decides.
      await page
        .getByText('1 row of 4 rejected: nothing is stored until you decide')
        .waitFor({ timeout: 30_000 });
      const errors = page.getByRole('table', { name: /Rejected rows/ });
      const errorRows = errors.getByRole('row');
      expect(await errorRows.count()).toBe(2);
      const cells = await errorRows.nth(1).getByRole('cell').allInnerTexts();
      expect(cells[0]).toBe('5');
      expect(cells[1]).toBe('SD');
      expect(cells[2]).toBe('sd_not_positive');
      expect(cells[3]).toMatch(/greater than 0/);
      await snap(page, 'upload-3-needs-review');

      // The list downloads as a CSV file made in the browser.
      const [download] = await Promise.all([
        page.waitForEvent('download'),
        page.getByRole('button', { name: 'Download the list (CSV)' }).click(),
      ]);
      expect(download.suggestedFilename()).toBe('pl003-december-rejected-rows.csv');
      const csv = readFileSync(await download.path(), 'utf8').split('\r\n');
      expect(csv[0]).toBe('line,column,code,message');
      expect(csv[1]).toMatch(/^5,SD,sd_not_positive,.*greater than 0/);

      await page.getByRole('button', { name: 'Discard this upload' }).click();
      await page.getByText('Nothing from this file was stored.').waitFor();
      await report.getByText(/No results of your lab are stored for December 2026 yet/).waitFor();

      // The corrected file, chosen with the file picker: the lab's mapping is remembered.
      await page.getByRole('button', { name: 'Send another file' }).click();
      await page.getByLabel('Choose a file').setInputFiles({
        name: 'pl003-december-fixed.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from(fixedFile),
      });
      await page.getByRole('heading', { name: 'Match the columns of pl003-december-fixed.csv' }).waitFor();
      expect(await page.getByLabel('procedure', { exact: true }).inputValue()).toBe('Assay code');
      await page.getByText(/saved column choices are filled in/).waitFor();
      await page.getByRole('button', { name: 'Upload and check the file' }).click();

      // The progress bar while the worker checks and stores the file.
      const bar = page.getByRole('progressbar');
      await bar.waitFor({ timeout: 30_000 });
      const progress = Number(await bar.getAttribute('aria-valuenow'));
      expect(progress).toBeGreaterThanOrEqual(0);
      expect(progress).toBeLessThanOrEqual(100);
      await snap(page, 'upload-4-progress');

      await page.getByText('Stored: 4 rows accepted').waitFor({ timeout: 30_000 });
      expect(await bar.count()).toBe(0);

      // The month's report after: the four results of the file, with the lab's own figures.
      await report.getByText('results stored').waitFor({ timeout: 15_000 });
      expect(await report.getByLabel('Period').inputValue()).toBe(PERIOD);
      const reportText = await report.innerText();
      expect(reportText).toMatch(/4\s*results stored/);
      expect(reportText).toContain('K1');
      expect(reportText).toContain('3.620');
      expect(reportText).toContain('128.40');

      // The lab's history lists both files: the discarded one and the stored one.
      const history = page.getByRole('table', { name: 'Your lab’s uploads' });
      await history.getByText('Stored', { exact: true }).waitFor();
      expect(await history.getByRole('row').count()).toBe(3);
      expect(await history.getByText('Discarded', { exact: true }).count()).toBe(1);
      await snap(page, 'upload-5-stored');

      // Details of the discarded upload, chosen from the history.
      await history.getByRole('button', { name: 'pl003-december.csv' }).click();
      const details = page.getByRole('region', { name: 'pl003-december.csv' });
      await details.getByText('Nothing from this file was stored.').waitFor();
      await snap(page, 'upload-6-details');
    } finally {
      await browser.close();
    }
  });
});
