// Headless Debian Chromium through playwright-core, with a fresh profile per session and a
// guard that aborts (and records) any request that would leave this machine.
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { mkdtemp, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';

export const CHROMIUM = '/usr/bin/chromium';
const ARGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

export interface BrowserSession {
  context: BrowserContext;
  page: Page;
  /** Every request the guard refused: must stay empty. */
  leftLocalhost: string[];
  pageErrors: string[];
  close: () => Promise<void>;
}

const LOCAL_HOSTS = new Set(['127.0.0.1', 'localhost', '[::1]']);

export async function openBrowser(viewport = { width: 1366, height: 900 }): Promise<BrowserSession> {
  const profile = await mkdtemp(path.join(tmpdir(), 'weir-chromium-'));
  // Playwright wants the profile as launchPersistentContext's first argument, not as --user-data-dir.
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: ARGS,
    viewport,
    acceptDownloads: true,
    locale: 'en-GB',
    timezoneId: 'UTC',
  });
  // Fail on a missing element well before the test's own timeout, naming the locator.
  context.setDefaultTimeout(10_000);
  const leftLocalhost: string[] = [];
  await context.route('**/*', (route) => {
    const url = new URL(route.request().url());
    if (url.protocol === 'data:' || url.protocol === 'blob:' || LOCAL_HOSTS.has(url.hostname)) return route.continue();
    leftLocalhost.push(url.href);
    return route.abort('blockedbyclient');
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const pageErrors: string[] = [];
  page.on('pageerror', (e) => pageErrors.push(e.message));
  return {
    context,
    page,
    leftLocalhost,
    pageErrors,
    close: async () => {
      await context.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}
