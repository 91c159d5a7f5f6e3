// The coordinator's journey through the browser: on the demo network, merge two glucose peer groups
// after reading the preview, exclude one lab's data for the month with a reason, then close and publish
// the month. The real API serves the built web app on a scratch database.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, eq } from 'drizzle-orm';
import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import {
  auditEvents,
  peerExclusions,
  peerGroups,
  peerStatistics,
  periods,
  publications,
  publishPeriodsWithoutSnapshot,
  recomputeAllPeerStatistics,
} from '@plumbline/db';
import { startServer } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
const coordinator = demoAccounts.find((a) => a.role === 'coordinator')!;
// The demo's latest past month: open, with data from every lab but one.
const PERIOD = '2026-11';
// Glucose on the demo's instrument groups: two labs on the Vantorrel V2 and one on the Kestrimoor K-90,
// both with glucose oxidase — too few for figures of their own at the instrument tier.
const smallGroup = 'Vantorrel Series V2 · Glucose oxidase · Vantorrel V-series reagents';
const singleGroup = 'Kestrimoor K-90 · Glucose oxidase · Kestrimoor K reagents';
const exclusionReason = 'Imprecision about 2.5 times the peers this month; the lab is recalibrating';

let server: Awaited<ReturnType<typeof startServer>>;

beforeAll(async () => {
  server = await startServer('e2ecoordinator', async (scratch) => {
    await seedDemoNetwork(scratch.db, { password: PASSWORD });
    // As `npm start` does: figures for every month, and snapshots of the months marked published.
    await recomputeAllPeerStatistics(scratch.db);
    await publishPeriodsWithoutSnapshot(scratch.db, { actorLabel: 'demo seed' });
  });
});
afterAll(async () => server?.close());

describe.skipIf(!chromiumAvailable())('the coordinator adjusts peer groups and publishes the month', () => {
  it('when the coordinator merges two groups with the preview, excludes a lab with a reason and publishes, then each step shows and is stored', async () => {
    const browser = await launchBrowser();
    try {
      const { page } = browser;
      await page.goto(`${server.url}/sign-in`);
      await page.getByLabel('E-mail address').fill(coordinator.email);
      await page.getByLabel('Password').fill(PASSWORD);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.waitForURL(`${server.url}/network`);

      // The peer groups of the next month to publish, on the lot in use.
      await page.getByRole('navigation').first().getByRole('link', { name: 'Peer groups' }).click();
      await page.waitForURL(/\/network\/peer-groups/);
      await page.getByRole('table', { name: /^Peer groups: same instrument model/ }).waitFor();
      expect(await page.getByLabel('Period', { exact: true }).inputValue()).toBe(PERIOD);
      expect(
        await page.getByLabel('Control lot', { exact: true }).locator('option:checked').textContent(),
      ).toContain('PGC-26187');
      await page.getByLabel('Analyte', { exact: true }).selectOption({ label: 'Glucose (GLU)' });
      await page.waitForURL(/analyte=/);
      const instrument = page.getByRole('table', { name: /^Peer groups: same instrument model/ });
      await instrument.getByText(smallGroup).waitFor();
      await snap(page, 'coordinator-peer-groups');

      // Merge: select the two small groups, read the preview, give the reason, confirm.
      await instrument.getByRole('checkbox', { name: `Select ${smallGroup}` }).check();
      await instrument.getByRole('checkbox', { name: `Select ${singleGroup}` }).check();
      await page.getByRole('button', { name: /^Merge the selected groups \(same instrument/ }).click();
      const mergeDialog = page.getByRole('dialog', { name: 'Merge two groups' });
      const after = mergeDialog.getByRole('region', { name: 'After, level 1' });
      await after.waitFor();
      const merged = after.getByRole('article', { name: smallGroup });
      expect(await merged.textContent()).toContain('Members: PL-029, PL-036, PL-047');
      expect(await merged.locator('dt:has-text("Labs in the figures") + dd').textContent()).toBe('3');
      expect(
        await mergeDialog
          .getByRole('region', { name: 'Before, level 1' })
          .getByText('Too few labs to publish')
          .count(),
      ).toBe(2);
      await snap(page, 'coordinator-merge-preview');
      await mergeDialog
        .getByLabel(/Why do these groups belong together/)
        .fill('Same glucose oxidase chemistry and calibrator');
      await mergeDialog.getByRole('button', { name: 'Confirm merge' }).click();
      await mergeDialog.waitFor({ state: 'detached' });
      const mergedRow = instrument.getByRole('row', { name: new RegExp(smallGroup) });
      await mergedRow.getByText(`Merged with “${singleGroup}”`).waitFor();
      expect(await mergedRow.getByText('Enough labs').count()).toBe(1);
      expect(
        await page
          .getByRole('button', { name: /^Merge the selected groups \(same instrument/ })
          .textContent(),
      ).toContain('(0/2)');

      // Exclude PL-014's glucose for the month, with a reason, after the preview.
      const tesselynd = instrument.getByRole('row', { name: /Tesselynd Chemline 8/ }).first();
      await tesselynd.getByRole('button', { name: /^Members of/ }).click();
      await page.getByRole('button', { name: 'Exclude PL-014 GLU' }).click();
      const excludeDialog = page.getByRole('dialog', { name: 'Exclude a lab’s data' });
      await excludeDialog.getByRole('region', { name: 'After, level 1' }).waitFor();
      expect(
        await excludeDialog
          .getByRole('region', { name: 'After, level 1' })
          .getByText('PL-014 GLU excluded by you')
          .count(),
      ).toBeGreaterThan(0);
      await excludeDialog.getByLabel(/Why is this lab’s data left out/).fill(exclusionReason);
      await snap(page, 'coordinator-exclude-preview');
      await excludeDialog.getByRole('button', { name: 'Confirm exclusion' }).click();
      await excludeDialog.waitFor({ state: 'detached' });
      const history = page.getByRole('table', { name: 'Adjustments of this lot and analyte' });
      await history.getByText(exclusionReason).waitFor();
      expect(await history.getByRole('button', { name: /^Undo: / }).count()).toBe(2);

      // Publish: the month must be closed first.
      await page.getByRole('navigation').first().getByRole('link', { name: 'Cycles' }).click();
      await page.getByRole('button', { name: 'Close November 2026' }).click();
      await page
        .getByRole('dialog', { name: 'Close November 2026?' })
        .getByRole('button', { name: 'Close period' })
        .click();
      await page.getByRole('button', { name: 'Publish November 2026' }).click();
      const publishDialog = page.getByRole('dialog', { name: 'Publish November 2026?' });
      await publishDialog.getByRole('button', { name: 'Publish', exact: true }).click();
      await page.getByText(/November 2026 is published as version 1/).waitFor();
      const row = page.getByRole('row', { name: /November 2026/ });
      await row.getByText('Version 1').waitFor();
      await snap(page, 'coordinator-published');
    } finally {
      await browser.close();
    }

    // What the journey stored.
    const [period] = await server.db.select().from(periods).where(eq(periods.period, PERIOD));
    expect(period.state).toBe('published');
    const [publication] = await server.db.select().from(publications).where(eq(publications.period, PERIOD));
    expect(await server.db.select().from(publications)).toHaveLength(6);
    expect(publication.version).toBe(1);
    const [exclusion] = await server.db.select().from(peerExclusions);
    expect(exclusion).toMatchObject({ period: PERIOD, level: 1, reason: exclusionReason, revokedAt: null });
    const [merge] = await server.db
      .select()
      .from(auditEvents)
      .where(eq(auditEvents.kind, 'peer-group.merge'));
    const [source] = await server.db
      .select()
      .from(peerGroups)
      .where(eq(peerGroups.id, String(merge.details.sourceGroupId)));
    expect(source.label).toBe(singleGroup);
    expect(source.mergedIntoId).toBe(merge.details.targetGroupId);
    const frozen = await server.db
      .select()
      .from(peerStatistics)
      .where(
        and(
          eq(peerStatistics.peerGroupId, source.mergedIntoId!),
          eq(peerStatistics.period, PERIOD),
          eq(peerStatistics.version, 1),
          eq(peerStatistics.level, 1),
          eq(peerStatistics.scope, 'period'),
        ),
      );
    expect(frozen[0]).toMatchObject({ labs: 3, sufficient: true });
    const kinds = (await server.db.select({ kind: auditEvents.kind }).from(auditEvents)).map((e) => e.kind);
    expect(kinds).toEqual(
      expect.arrayContaining(['peer-group.merge', 'peer-group.exclude', 'period.close', 'period.publish']),
    );
  });
});
