// Markup in names is inert in the reviewer: a site name, a push message, an attachment's caption
// and file name that carry HTML and script are shown as text on every page that shows them, run
// nothing, and the pages are served with a Content-Security-Policy that would block inline script
// anyway. Headless Chromium against the real server, with the built reviewer (npm run build:web).
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, type BrowserSession } from '../e2e/support/browser.ts';
import { FIXTURE, HTML_NAMES } from './support/hostile.ts';
import { login, pushYaml, ROOT, serverCommand, startRealServer, type RealServer } from './support/real-server.ts';

const WEB = path.join(ROOT, 'dist', 'web');
const SHOTS = path.join(ROOT, '.screenshots');
const SITE_ID = 'markup-works';
const SITE_NAME = HTML_NAMES[1];
const MESSAGE = HTML_NAMES[0];
const CAPTION = HTML_NAMES[2];
const PNG = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c63000100000500010d0a2db40000000049454e44ae426082', 'hex');

let dataDir: string;
let server: RealServer;
let browser: BrowserSession;
let revisionId: number;
const dialogs: string[] = [];

beforeAll(async () => {
  if (!existsSync(path.join(WEB, 'index.html'))) throw new Error('the reviewer is not built: run `npm run build:web` first (npm test does)');
  dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-markup-'));
  expect((await serverCommand(['seed'], dataDir)).exitCode).toBe(0);
  server = await startRealServer(dataDir, { WEIR_WEB_DIR: WEB });
  const installer = await login(server.url, 'installer@example.test');
  const text = FIXTURE.replace('id: mill-lane-bakery', `id: ${SITE_ID}`).replace('name: Mill Lane Bakery', `name: ${JSON.stringify(SITE_NAME)}`);
  const res = await fetch(`${server.url}/api/revisions?message=${encodeURIComponent(MESSAGE)}`, { method: 'POST', headers: { authorization: `Bearer ${installer}`, 'content-type': 'application/yaml' }, body: text });
  expect(res.status).toBe(201);
  revisionId = ((await res.json()) as { revision: { id: number } }).revision.id;
  const form = new FormData();
  form.append('caption', CAPTION);
  form.append('file', new Blob([PNG], { type: 'image/png' }), '<img src=x onerror="window.__weirXss = 6">.png');
  expect((await fetch(`${server.url}/api/sites/${SITE_ID}/attachments`, { method: 'POST', headers: { authorization: `Bearer ${installer}` }, body: form })).status).toBe(201);
  // A second push, so the diff view has a change to show.
  expect((await pushYaml(server.url, installer, text.replace('serial: EM-20931', 'serial: EM-20932'))).status).toBe(201);

  browser = await openBrowser();
  browser.page.on('dialog', (d) => {
    dialogs.push(d.message());
    void d.dismiss();
  });
  // Sign in through the API and hand the session to the page, as the sign-in form would.
  const signIn = await fetch(`${server.url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: 'lead@example.test', password: 'security-demo-password-4417' }) });
  const session = await signIn.json();
  await browser.page.goto(`${server.url}/sign-in`);
  await browser.page.evaluate((s) => localStorage.setItem('weir.session', JSON.stringify(s)), session);
}, 90_000);
afterAll(async () => {
  await browser?.close();
  await server?.kill('SIGTERM');
  if (dataDir) rmSync(dataDir, { recursive: true, force: true });
});

/** Nothing ran: no flag set by an injected script, no dialog, no element made from the markup. */
async function expectNothingRan() {
  const page = browser.page;
  expect(await page.evaluate(() => (window as unknown as { __weirXss?: unknown }).__weirXss)).toBeUndefined();
  expect(dialogs).toEqual([]);
  expect(await page.locator('img[src="x"], svg[onload], iframe[srcdoc], a[href^="javascript:"]').count()).toBe(0);
  expect(await page.evaluate(() => [...document.scripts].filter((s) => s.textContent?.includes('__weirXss')).length)).toBe(0);
  expect(browser.pageErrors).toEqual([]);
  expect(browser.leftLocalhost).toEqual([]);
}

describe('markup in the reviewer', () => {
  it('When the site list shows a site whose name is HTML, then the name is text and nothing runs', async () => {
    await browser.page.goto(`${server.url}/sites`);
    await browser.page.getByText(SITE_NAME).first().waitFor();
    await expectNothingRan();
  });

  it('When the site page shows the name, the attachment\'s caption and file name, then all are text and nothing runs', async () => {
    await browser.page.goto(`${server.url}/sites/${SITE_ID}`);
    await browser.page.getByText(SITE_NAME).first().waitFor();
    await browser.page.getByText(CAPTION).first().waitFor();
    await expectNothingRan();
    // For a person to look at (git-ignored): the markup shows as text.
    mkdirSync(SHOTS, { recursive: true });
    await browser.page.screenshot({ path: path.join(SHOTS, 'security-markup-site.png'), fullPage: true });
  });

  it('When the review page shows the push message and the site file, then they are text and nothing runs', async () => {
    await browser.page.goto(`${server.url}/revisions/${revisionId}`);
    await browser.page.getByText(MESSAGE).first().waitFor();
    await expectNothingRan();
  });

  it('When the change log lists the events, then the markup in them is text and nothing runs', async () => {
    await browser.page.goto(`${server.url}/change-log`);
    await browser.page.getByText(SITE_ID).first().waitFor();
    await expectNothingRan();
  });
});

describe('headers of the reviewer\'s pages', () => {
  it('When a page is served, then a CSP forbids inline and foreign script, framing and plugins, and types are not sniffed', async () => {
    for (const page of ['/', '/sites', `/revisions/${revisionId}`]) {
      const res = await fetch(`${server.url}${page}`);
      expect(res.status).toBe(200);
      expect(res.headers.get('content-type')).toMatch(/^text\/html/);
      const csp = res.headers.get('content-security-policy') ?? '';
      const directive = (name: string) => new RegExp(`(?:^|;)\\s*${name}\\s+([^;]*)`).exec(csp)?.[1] ?? '';
      const scripts = directive('script-src') || directive('default-src');
      expect(scripts, csp).toMatch(/'self'/);
      expect(scripts, csp).not.toMatch(/'unsafe-inline'|'unsafe-eval'|\*|https?:/);
      expect(directive('object-src'), csp).toBe("'none'");
      expect(directive('frame-ancestors'), csp).toMatch(/'self'|'none'/);
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      await res.text();
    }
  });
});
