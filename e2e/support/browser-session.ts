import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { chromiumPath } from './chromium-path';

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Every request the page made to an origin other than the app's own. */
  foreignRequests: string[];
  screenshot: (name: string) => Promise<string>;
  close: () => Promise<void>;
}

// Flags for a headless Chromium on a machine with no outside network.
const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
];

/** Opens the system Chromium on a fresh profile and records any request that leaves the app's origin. */
export async function openBrowser(appUrl: string): Promise<BrowserSession> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'clearbase-chromium-'));
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: chromiumPath(),
    headless: true,
    args: chromiumArgs,
    viewport: { width: 1280, height: 800 },
  });
  const origin = new URL(appUrl).origin;
  const foreignRequests: string[] = [];
  context.on('request', (request) => {
    const url = request.url();
    if (url.startsWith('data:') || url.startsWith('blob:')) return;
    if (new URL(url).origin !== origin) foreignRequests.push(url);
  });
  const page = context.pages()[0] ?? (await context.newPage());
  mkdirSync('e2e/artifacts', { recursive: true });
  return {
    context,
    page,
    foreignRequests,
    screenshot: async (name: string) => {
      const path = join('e2e/artifacts', `${name}.png`);
      await page.screenshot({ path, fullPage: true });
      return path;
    },
    close: async () => {
      await context.close();
      rmSync(userDataDir, { recursive: true, force: true });
    },
  };
}
