import { seedDemoNetwork, demoAccounts } from '@plumbline/db/seed';
import { recomputeAllPeerStatistics } from '@plumbline/db';
import { startServer } from '../helpers/server.ts';
import { launchBrowser } from '../helpers/browser.ts';

const server = await startServer('peerwidth', async (scratch) => {
  await seedDemoNetwork(scratch.db, { password: 'pw-debug-123456' });
  await recomputeAllPeerStatistics(scratch.db);
});
const browser = await launchBrowser();
try {
  const { page } = browser;
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail address').fill(demoAccounts[0].email);
  await page.getByLabel('Password').fill('pw-debug-123456');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${server.url}/network`);
  await page.goto(`${server.url}/network/peer-groups`);
  await page.getByRole('table', { name: /^Peer groups: same instrument model/ }).waitFor();
  const info = await page.evaluate(() => {
    const vw = document.documentElement.clientWidth;
    const wide = [...document.querySelectorAll('*')]
      .map((e) => ({ tag: e.tagName, cls: (e as HTMLElement).className?.toString().slice(0, 80), right: e.getBoundingClientRect().right, w: e.getBoundingClientRect().width }))
      .filter((x) => x.right > vw + 1)
      .slice(0, 15);
    return { vw, sw: document.documentElement.scrollWidth, wide };
  });
  console.log(JSON.stringify(info, null, 1));
} finally {
  await browser.close();
  await server.close();
}
