import { chromium } from 'playwright-core';
import { seedDemoNetwork } from '@plumbline/db/seed';
import { recomputeAllPeerStatistics } from '@plumbline/db';
import { startServer } from '../helpers/server.ts';
const server = await startServer('dbglab', async (s) => { await seedDemoNetwork(s.db, { password: 'pw-shots-12345' }); await recomputeAllPeerStatistics(s.db); });
const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox'] });
try {
  const page = await browser.newPage({ viewport: { width: 1366, height: 900 } });
  await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail address').fill('supervisor.pl022@plumbline.example');
  await page.getByLabel('Password').fill('pw-shots-12345');
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL(`${server.url}/lab`);
  await page.goto(`${server.url}/lab/peer-report?period=2026-11`);
  await page.getByRole('table', { name: 'Peer report of November 2026' }).waitFor();
  await page.screenshot({ path: '/tmp/lab-shots/x-report2.png', fullPage: true });
  console.log(await page.evaluate(() => {
    const out: string[] = [String(document.documentElement.scrollWidth)];
    for (const el of Array.from(document.querySelectorAll('body *'))) {
      const r = el.getBoundingClientRect();
      if (r.right > 1366 && el.parentElement && el.parentElement.getBoundingClientRect().right <= 1366) out.push(`${el.tagName}.${(el.className || '').toString().slice(0, 80)} right=${r.right}`);
    }
    const main = document.querySelector('main')!; out.push('main ' + main.getBoundingClientRect().width);
    return out.join('\n');
  }));
} finally { await browser.close(); await server.close(); }
