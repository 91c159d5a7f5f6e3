import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import { startServer } from '../helpers/server.ts';
import { chromiumAvailable, launchBrowser, snap } from '../helpers/browser.ts';

const PASSWORD = 'e2e-demo-password';
let server: Awaited<ReturnType<typeof startServer>>;

beforeAll(async () => {
  server = await startServer('e2esignin', async (scratch) => {
    await seedDemoNetwork(scratch.db, { password: PASSWORD });
  });
});
afterAll(async () => server?.close());

// Each demo role lands on its own home after signing in through the real web app and API.
const homes = [
  { role: 'coordinator', path: '/network', nav: 'Peer groups', absent: 'Uploads' },
  { role: 'supervisor', path: '/lab', nav: 'Lab administration', absent: 'Peer groups' },
  { role: 'analyst', path: '/lab', nav: 'Peer report', absent: 'Lab administration' },
] as const;

describe.skipIf(!chromiumAvailable())('signing in through the browser', () => {
  for (const home of homes) {
    it(`when the demo ${home.role} signs in, then the ${home.role}'s home shows with its navigation`, async () => {
      const account = demoAccounts.find((a) => a.role === home.role)!;
      const browser = await launchBrowser();
      try {
        const { page } = browser;
        await page.goto(`${server.url}/`);
        await page.waitForURL(/\/sign-in/);
        await page.getByLabel('E-mail address').fill(account.email);
        await page.getByLabel('Password').fill(PASSWORD);
        await page.getByRole('button', { name: 'Sign in' }).click();
        await page.waitForURL(`${server.url}${home.path}`);
        const nav = page.getByRole('navigation').first();
        // The navigation renders once the session's user is loaded: wait for it before counting links.
        await nav.getByRole('link', { name: home.nav, exact: true }).waitFor();
        expect(await nav.getByRole('link', { name: home.nav, exact: true }).count()).toBe(1);
        expect(await nav.getByRole('link', { name: home.absent, exact: true }).count()).toBe(0);
        expect(await page.getByText(/do not replace, the laboratory director/).count()).toBeGreaterThan(0);
        await snap(page, `home-${home.role}`);
        // The session is an httpOnly cookie: page scripts cannot read it and nothing stores it.
        const cookies = await browser.context.cookies();
        const session = cookies.find((c) => c.name === 'plumbline_session');
        expect(session).toMatchObject({ httpOnly: true, sameSite: 'Strict' });
        // Evaluated in the page (a string, as this project's tests are type-checked without the DOM).
        expect(await page.evaluate('document.cookie')).not.toContain('plumbline_session');
        const stored = await page.evaluate('JSON.stringify({ ...localStorage, ...sessionStorage })');
        expect(stored).not.toContain(session!.value);
        expect(browser.cspViolations).toEqual([]);
      } finally {
        await browser.close();
      }
    });
  }

  it('when the password is wrong, then the sign-in page says so and stays', async () => {
    const browser = await launchBrowser();
    try {
      const { page } = browser;
      await page.goto(`${server.url}/sign-in`);
      await page.getByLabel('E-mail address').fill(demoAccounts[0].email);
      await page.getByLabel('Password').fill('not-the-password');
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByText(/e-mail address or password is incorrect/i).waitFor();
      expect(page.url()).toContain('/sign-in');
    } finally {
      await browser.close();
    }
  });

  it('when the API reference page is opened, then it lists the routes under the strict CSP', async () => {
    const browser = await launchBrowser();
    try {
      const { page } = browser;
      await page.goto(`${server.url}/api/reference`);
      await page.getByText('/labs/{labId}/peer-report', { exact: true }).first().waitFor();
      expect(await page.getByRole('heading', { name: 'Peer groups' }).count()).toBe(1);
      await snap(page, 'api-reference');
      expect(browser.cspViolations).toEqual([]);
    } finally {
      await browser.close();
    }
  });
});
