// The reviewer in headless Chromium against the real server with the seeded demo.
// Screenshots of every screen go to .screenshots/ (git-ignored) to be looked at.
import { mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { gzipSync } from 'node:zlib';
import jwt from 'jsonwebtoken';
import type { Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openBrowser, type BrowserSession } from './support/browser.ts';
import { apiAs, buildAll, DEMO_PASSWORD, ROOT, startServer, type RunningServer } from './support/weir-server.ts';

const SHOTS = path.join(ROOT, '.screenshots');
const LEAD = 'lead@example.test';
const INSTALLER = 'installer@example.test';
const AUDITOR = 'auditor@example.test';
const ADMIN = 'admin@example.test';

interface RevisionBody {
  id: number;
  number: number;
  siteId: string;
  state: string;
  yaml: string;
  findings: { ruleId: string; severity: string }[];
  diff: unknown[];
  approvalBlockers: string[];
}
interface SiteItem { id: string; name: string; status: string; approvedRevisionId: number | null; latestRevision: { id: number; number: number; state: string } | null }

let server: RunningServer;
const sessions: BrowserSession[] = [];

async function browser(viewport?: { width: number; height: number }) {
  const session = await openBrowser(viewport);
  sessions.push(session);
  return session;
}

async function shot(page: Page, name: string) {
  mkdirSync(SHOTS, { recursive: true });
  await page.screenshot({ path: path.join(SHOTS, `${name}.png`), fullPage: true });
}

async function signIn(page: Page, email: string, password = DEMO_PASSWORD) {
  if (!page.url().includes('/sign-in')) await page.goto(`${server.url}/sign-in`);
  await page.getByLabel('E-mail').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'));
  await page.getByRole('navigation', { name: 'Main' }).waitFor();
}

/** A pending revision the lead may approve: someone else's, no errors, on the approval in force. */
async function approvableRevision(): Promise<{ site: SiteItem; revision: RevisionBody }> {
  const lead = await apiAs(server, LEAD);
  const { body } = await lead<{ items: SiteItem[] }>('/sites?state=pending&limit=100');
  for (const site of body.items) {
    if (!site.latestRevision) continue;
    const { body: detail } = await lead<{ revision: RevisionBody }>(`/revisions/${site.latestRevision.id}`);
    if (detail.revision.approvalBlockers.length === 0 && detail.revision.diff.length > 0) return { site, revision: detail.revision };
  }
  throw new Error(`the seed has no pending revision that ${LEAD} may approve`);
}

beforeAll(async () => {
  await buildAll(20 * 60_000);
  server = await startServer();
}, 25 * 60_000);

afterAll(async () => {
  for (const s of sessions) await s.close().catch(() => undefined);
  await server?.stop();
});

describe('the reviewer', () => {
  it('signs in by e-mail and password, with a clear error for a wrong password', async () => {
    const { page } = await browser();
    await page.goto(`${server.url}/sites`);
    await page.waitForURL(/\/sign-in\?next=%2Fsites/);
    await expect(page.locator('input[type="email"][name="email"]').count()).resolves.toBe(1);
    await expect(page.locator('input[type="password"][name="password"]').count()).resolves.toBe(1);
    await shot(page, '01-sign-in');

    await page.getByLabel('E-mail').fill(LEAD);
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await expect(page.getByRole('alert').textContent()).resolves.toMatch(/do not match an active account/);
    await shot(page, '02-sign-in-error');

    await page.getByLabel('Password').fill(DEMO_PASSWORD);
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${server.url}/sites`);
    // The session survives a reload.
    await page.reload();
    await page.getByRole('table').waitFor();
    expect(page.url()).toBe(`${server.url}/sites`);
  });

  it('a lead opens a pending revision, sees its findings and diff, approves it, and finds the event in the change log', async () => {
    const { site, revision } = await approvableRevision();
    const { page } = await browser();
    await signIn(page, LEAD);

    // Sites: a real table, with search and state filter on the server.
    const table = page.getByRole('table');
    await table.waitFor();
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(['Sites', 'Change log']);
    await shot(page, '03-sites');
    await page.getByLabel('State').selectOption('pending');
    await page.getByLabel('Search').fill(site.id);
    await page.waitForURL(/state=pending/);
    await page.waitForURL(new RegExp(`q=${site.id}`));
    await table.getByRole('link', { name: site.name, exact: true }).click();

    // Site page: summary, diagram, chart, history, attachments and the caution.
    await page.waitForURL(`${server.url}/sites/${site.id}`);
    await page.getByRole('heading', { name: 'Single-line diagram' }).waitFor();
    await page.getByRole('heading', { name: 'Safety caution' }).waitFor();
    await page.getByRole('heading', { name: 'Phase balance' }).waitFor();
    await shot(page, '04-site');
    await page.getByRole('link', { name: `Review revision ${revision.number}` }).click();

    // Review: findings grouped by severity, linked to their lines; the diff; the decision.
    await page.waitForURL(`${server.url}/revisions/${revision.id}`);
    await page.getByRole('heading', { name: 'Findings' }).waitFor();
    for (const severity of new Set(revision.findings.map((f) => f.severity))) {
      await page.locator(`[data-severity-group="${severity}"]`).waitFor();
    }
    if (revision.findings.length > 0) {
      const first = page.getByRole('link', { name: /^Line \d+, column \d+/ }).first();
      await first.click();
      await page.locator('tr[aria-current="location"]').waitFor();
    }
    // Whole sections added or removed are listed field by field; changed fields one to one.
    expect(await page.locator('[data-change]').count()).toBeGreaterThanOrEqual(revision.diff.length);
    for (const change of revision.diff as { path: string; kind: string }[]) {
      if (change.kind === 'changed') await page.locator(`tr[data-path="${change.path}"][data-change="changed"]`).waitFor();
    }
    await page.getByRole('heading', { name: 'Safety caution' }).waitFor();
    await shot(page, '05-review');

    await page.getByLabel('Comment').fill('Checked the CT photos against the diagram. <b>fine</b>');
    await page.getByRole('button', { name: '✓ Approve' }).click();
    await page.getByText(`Revision ${revision.number} approved.`).waitFor();
    // The page refreshes without a reload: the state and the blockers follow the decision.
    await page.locator('dl').getByText('Approved', { exact: true }).waitFor();
    await page.getByRole('button', { name: /Cannot approve: no longer pending/ }).waitFor();
    await shot(page, '06-review-approved');

    // The sites list shows it approved without a reload.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Sites' }).click();
    await page.getByLabel('Search').fill(site.id);
    await page.waitForURL(new RegExp(`q=${site.id}`));
    const row = page.getByRole('row', { name: new RegExp(site.name) });
    await row.getByText('Approved', { exact: true }).waitFor();

    // The change log has the event, with the comment rendered as text.
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Change log' }).click();
    await page.getByLabel('Site', { exact: true }).fill(site.id);
    await page.getByLabel('Action').selectOption('revision.approved');
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL(/action=revision.approved/);
    const event = page.locator(`tr[data-action="revision.approved"][data-revision="${revision.id}"]`);
    await event.waitFor();
    expect(await event.textContent()).toContain(LEAD);
    expect(await event.textContent()).toContain('<b>fine</b>');
    await page.locator('[data-chain="verified"]').waitFor();
    await shot(page, '07-change-log');
  }, 90_000);

  it('an installer sees no approve button and no change log or accounts', async () => {
    const lead = await apiAs(server, LEAD);
    const { body } = await lead<{ items: SiteItem[] }>('/sites?state=pending&limit=1');
    const pending = body.items[0];
    expect(pending?.latestRevision).toBeTruthy();
    const { page } = await browser();
    await signIn(page, INSTALLER);
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(['Sites']);
    await page.goto(`${server.url}/revisions/${pending.latestRevision!.id}`);
    await page.getByRole('heading', { name: 'Findings' }).waitFor();
    await page.getByText('Only lead engineers approve or return revisions.', { exact: false }).waitFor();
    expect(await page.getByRole('button', { name: /approve/i }).count()).toBe(0);
    await shot(page, '08-review-as-installer');
    // The installer may upload to the site page; the form is there.
    await page.goto(`${server.url}/sites/${pending.id}`);
    await page.getByRole('form', { name: 'Upload an attachment' }).waitFor();
    // And a page for another role says so.
    await page.goto(`${server.url}/change-log`);
    await page.getByRole('heading', { name: 'Not for your role' }).waitFor();
  });

  it('a lead is refused approval of their own revision, with the reason shown', async () => {
    const lead = await apiAs(server, LEAD);
    const { body } = await lead<{ items: SiteItem[] }>('/sites?state=approved&limit=1');
    const site = body.items[0];
    const { body: approved } = await lead<{ revision: RevisionBody }>(`/revisions/${site.approvedRevisionId}`);
    const changed = approved.revision.yaml.replace(/^(\s+name:\s*)(.+)$/m, (_m, key: string, name: string) => `${key}${name.replace(/^["']|["']$/g, '')} annexe`);
    expect(changed).not.toBe(approved.revision.yaml);
    const pushed = await lead<{ revision: { id: number; number: number } }>('/revisions?message=' + encodeURIComponent('renamed after the annexe was added'), {
      method: 'POST',
      headers: { 'Content-Type': 'application/yaml' },
      body: changed,
    });
    expect(pushed.status).toBe(201);

    const { page } = await browser();
    await signIn(page, LEAD);
    await page.goto(`${server.url}/revisions/${pushed.body.revision.id}`);
    const button = page.getByRole('button', { name: /Cannot approve: your own revision/ });
    await button.waitFor();
    expect(await button.isDisabled()).toBe(true);
    await page.locator('[data-blocker="own-revision"]').getByText(/Another lead engineer must review it/).waitFor();
    await shot(page, '09-own-revision');
  });

  it('an auditor exports the change log as CSV and sees the chain verified', async () => {
    const { page } = await browser();
    await signIn(page, AUDITOR);
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(['Sites', 'Change log']);
    await page.goto(`${server.url}/change-log`);
    await page.locator('[data-chain="verified"]').waitFor();
    const [download] = await Promise.all([
      page.waitForEvent('download'),
      page.getByRole('button', { name: /Export CSV/ }).click(),
    ]);
    expect(download.suggestedFilename()).toMatch(/^weir-change-log-\d{4}-\d{2}-\d{2}\.csv$/);
    const file = await download.path();
    const csv = readFileSync(file, 'utf8');
    const lines = csv.trim().split(/\r?\n/);
    expect(lines.length).toBeGreaterThan(1);
    expect(lines[0].toLowerCase()).toContain('action');
    expect(csv).toContain('revision.pushed');
    await shot(page, '10-change-log-auditor');
  });

  it('an admin manages accounts and reads the demo outbox', async () => {
    const { page } = await browser();
    await signIn(page, ADMIN);
    expect(await page.getByRole('navigation', { name: 'Main' }).getByRole('link').allTextContents()).toEqual(['Sites', 'Change log', 'Accounts']);
    await page.goto(`${server.url}/accounts`);
    await page.getByRole('heading', { name: 'People' }).waitFor();
    const form = page.getByRole('form', { name: 'New account' });
    await form.getByLabel('Name').fill('Rowan Testfield');
    await form.getByLabel('E-mail').fill('rowan@example.test');
    await form.getByLabel('Role').selectOption('auditor');
    await form.getByLabel('First password').fill('a-long-first-password');
    await form.getByRole('button', { name: 'Create account' }).click();
    await page.getByText('Account made for Rowan Testfield (Auditor).').waitFor();
    const row = page.getByRole('row', { name: /Rowan Testfield/ });
    await row.getByLabel('Role of Rowan Testfield').selectOption('lead');
    await row.getByRole('button', { name: 'Disable Rowan Testfield' }).click();
    await row.getByText('⊘ Disabled').waitFor();
    const admin = await apiAs(server, ADMIN);
    const { body } = await admin<{ items: { email: string; role: string; disabled: boolean }[] }>('/users');
    expect(body.items.find((u) => u.email === 'rowan@example.test')).toMatchObject({ role: 'lead', disabled: true });
    await page.getByRole('heading', { name: /Mail outbox/ }).waitFor();
    await shot(page, '11-accounts');
  });

  it('an expired token returns the user to sign-in, then back where they were', async () => {
    const lead = await apiAs(server, LEAD);
    const { body } = await lead<{ items: SiteItem[] }>('/sites?limit=1');
    const target = `/sites/${body.items[0].id}`;
    const { page } = await browser();
    await signIn(page, LEAD);
    // A token signed with the server's secret whose lifetime is over (jsonwebtoken's `exp`).
    await page.evaluate(([secret]) => {
      const session = JSON.parse(localStorage.getItem('weir.session')!);
      session.token = secret;
      localStorage.setItem('weir.session', JSON.stringify(session));
    }, [jwt.sign({ tv: 0 }, 'e2e-secret-for-the-reviewer-tests-only-0000', { algorithm: 'HS256', subject: '1', expiresIn: -60 })]);
    await page.goto(`${server.url}${target}`);
    await page.waitForURL(/\/sign-in\?next=/);
    await page.getByText('Your session has ended.', { exact: false }).waitFor();
    await shot(page, '12-session-expired');
    await signIn(page, LEAD);
    expect(new URL(page.url()).pathname).toBe(target);
  }, 60_000);

  it('fits a tablet', async () => {
    const { page } = await browser({ width: 820, height: 1180 });
    await signIn(page, LEAD);
    await page.getByRole('table').waitFor();
    await shot(page, '13-sites-tablet');
    const lead = await apiAs(server, LEAD);
    const { body } = await lead<{ items: SiteItem[] }>('/sites?sort=-errors&limit=1');
    await page.goto(`${server.url}/revisions/${body.items[0].latestRevision!.id}`);
    await page.getByRole('heading', { name: 'Findings' }).waitFor();
    await shot(page, '14-review-tablet');
    await page.goto(`${server.url}/sites/${body.items[0].id}`);
    await page.getByRole('heading', { name: 'Single-line diagram' }).waitFor();
    await shot(page, '15-site-tablet');
    // Nothing overflows the page sideways (wide tables and the diagram scroll in their own box).
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(820);
  });

  it('keeps the JavaScript of the first page within 180 KB gzip, without the engine', async () => {
    const { context, page } = await browser();
    await signIn(page, LEAD);
    // A fresh load of the sites list, as after a reload: every script it fetches counts.
    const fresh = await context.newPage();
    const scripts: { url: string; gzip: number }[] = [];
    fresh.on('response', async (response) => {
      if (response.request().resourceType() !== 'script') return;
      scripts.push({ url: response.url(), gzip: gzipSync(await response.body()).length });
    });
    await fresh.goto(`${server.url}/sites`);
    await fresh.getByRole('table').waitFor();
    await fresh.waitForLoadState('networkidle');
    const total = scripts.reduce((sum, s) => sum + s.gzip, 0);
    // Issue 7's budget: the initial route's JS ≤ 180 KB gzip.
    expect(total).toBeLessThanOrEqual(180 * 1024);
    // The YAML reader and the rules are for the site and review pages only.
    expect(scripts.map((s) => s.url).filter((u) => /read-site|yaml|shared/.test(u))).toEqual([]);
    await fresh.close();
  });

  it('sent no request off this machine and threw no page errors', () => {
    for (const s of sessions) {
      expect(s.leftLocalhost).toEqual([]);
      expect(s.pageErrors).toEqual([]);
    }
  });
});
