import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtempSync, rmSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/** Debian's Chromium, driven headless by playwright-core (never a downloaded browser). */
export const CHROMIUM_PATH = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';

export function chromiumAvailable(): boolean {
  return existsSync(CHROMIUM_PATH);
}

export async function launchBrowser(): Promise<{
  context: BrowserContext;
  page: Page;
  /** Content Security Policy violations the pages reported (the app must need no exception). */
  cspViolations: string[];
  close: () => Promise<void>;
}> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'plumbline-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: CHROMIUM_PATH,
    headless: true,
    viewport: { width: 1366, height: 900 },
    acceptDownloads: true,
    args: [
      '--no-sandbox',
      '--disable-gpu',
      '--disable-quic',
      '--no-first-run',
      '--disable-background-networking',
      '--disable-component-update',
      '--disable-sync',
    ],
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const cspViolations: string[] = [];
  context.on('console', (message) => {
    if (/Content Security Policy/i.test(message.text())) cspViolations.push(message.text());
  });
  return {
    context,
    page,
    cspViolations,
    close: async () => {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}

/** Saves a screenshot when SCREENSHOT_DIR is set, so a person can look at the pages. */
export async function snap(page: Page, name: string): Promise<void> {
  const dir = process.env.SCREENSHOT_DIR;
  if (dir) await page.screenshot({ path: join(dir, `${name}.png`), fullPage: true });
}
