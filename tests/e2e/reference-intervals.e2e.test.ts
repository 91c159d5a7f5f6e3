// Reference intervals through the browser: the supervisor of a demo lab creates a sodium study from the
// lab's (invented) routine results, watches it run, sees the histogram and the limits with their
// confidence intervals, and approves it. The real API serves the built web app; the study worker runs
// in this process on Redis.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Redis } from 'ioredis';
import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import { startStudyWorker } from '../../apps/worker/src/queues/study.queue.ts';
import { startServer } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
const supervisor = demoAccounts.find((a) => a.role === 'supervisor' && a.labCode === 'PL-003')!;

let server: Awaited<ReturnType<typeof startServer>>;
let connection: Redis;
let studies: ReturnType<typeof startStudyWorker>;

beforeAll(async () => {
  server = await startServer('e2eri', async (scratch) => {
    await seedDemoNetwork(scratch.db, { password: PASSWORD });
  });
  connection = new Redis(server.env.REDIS_URL, { maxRetriesPerRequest: null });
  studies = startStudyWorker(server.db, { connection, prefix: server.queuePrefix, log: () => {} });
});
afterAll(async () => {
  await studies?.close().catch(() => {});
  connection?.disconnect();
  await server?.close();
});

describe.skipIf(!chromiumAvailable())('a reference-interval study through the browser', () => {
  it('when the supervisor creates and runs a study on the demo data, then the histogram and limits show and it can be approved', async () => {
    const { page, close } = await launchBrowser();
    try {
      await page.goto(`${server.url}/sign-in`);
      await page.getByLabel('E-mail address').fill(supervisor.email);
      await page.getByLabel('Password').fill(PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(`${server.url}/lab`);

      await page.getByRole('navigation').first().getByRole('link', { name: 'Studies', exact: true }).click();
      await page.getByRole('link', { name: 'New study' }).click();
      await page.getByLabel('Name of the study').fill('Sodium, adult outpatients, browser test');
      await page.getByLabel('Analyte').selectOption({ label: 'Sodium (mmol/L)' });
      await page.getByLabel('outpatient').check();
      await page
        .getByTestId('matching-count')
        .getByText(/results match/)
        .waitFor();
      const countText = (await page.getByTestId('matching-count').textContent()) ?? '';
      expect(Number(countText.replace(/[^\d]/g, '').trim())).toBeGreaterThan(120);
      await snap(page, 'ri-new-study');
      await page.getByRole('button', { name: 'Create and run the study' }).click();

      await page.getByRole('heading', { name: /^Version 1/ }).waitFor({ timeout: 60_000 });
      const histograms = page.getByTestId('interval-histogram');
      expect(await histograms.count()).toBe(2);
      const lower = (await page.getByTestId('lower-limit').first().textContent()) ?? '';
      const upper = (await page.getByTestId('upper-limit').first().textContent()) ?? '';
      expect(lower).toMatch(/^1[23]\d(\.\d)? \(90 % CI/);
      expect(upper).toMatch(/^14\d(\.\d)? \(90 % CI/);
      await page
        .getByText(/laboratory director before clinical use/)
        .first()
        .waitFor();
      await page
        .getByText(/Harris & Boyd/)
        .first()
        .waitFor();
      await snap(page, 'ri-study');

      await page
        .getByLabel('Approval statement')
        .fill('Reviewed with the laboratory director for outpatient use.');
      await page.getByRole('button', { name: 'Approve version 1' }).click();
      await page.getByText(/Approved by/).waitFor();
      await snap(page, 'ri-approved');
      const rows = await server.scratch.pool.query(
        `select s.status, count(r.id)::int as versions from ri_studies s left join ri_study_results r on r.study_id = s.id
          where s.name = 'Sodium, adult outpatients, browser test' group by s.status`,
      );
      expect(rows.rows).toEqual([{ status: 'done', versions: 1 }]);
    } finally {
      await close();
    }
  }, 120_000);
});
