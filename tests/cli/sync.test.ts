// The server commands (login, whoami, push, status, diff, pull, log, audit verify, logout), run as
// built against the real server on a random port with a temporary SQLite file.
import { copyFileSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import sqlite3 from 'sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseDocument } from 'yaml';
import { checkSite, diffSites } from '../../shared/index.ts';
import { DEMO_PASSWORD, api, apiToken, startServer, type TestServer } from './server-helper.ts';
import { EXAMPLES, assertBuilt, tempDir, weir, type RunOptions } from './run-weir.ts';

let server: TestServer;
const config = tempDir('weir-sync-config-');
const work = tempDir('weir-sync-work-');
const exampleFiles = readdirSync(EXAMPLES).filter((f) => f.endsWith('.yaml')).sort();
const CLEAN_SITE = 'kiln-yard-workshop';
const exampleText = (name: string) => readFileSync(path.join(EXAMPLES, name), 'utf8');

/** The CLI as the signed-in installer (saved sign-in in a private config folder). */
const run = (args: string[], options: RunOptions = {}) => weir(args, { ...options, env: { XDG_CONFIG_HOME: config.dir, ...options.env } });
const json = <T = any>(stdout: string) => JSON.parse(stdout) as T;

beforeAll(async () => {
  assertBuilt();
  server = await startServer();
}, 120_000);
afterAll(async () => {
  await server?.stop();
  config.remove();
  work.remove();
});

describe('signing in', () => {
  it('refuses a wrong password (exit 2) and saves nothing', async () => {
    const r = await run(['login', '--server', server.url, '--email', 'installer@example.test', '--password-stdin'], { input: 'wrong-password\n' });
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('did not accept');
    expect(readdirSync(config.dir)).toEqual([]);
  });

  it('asks for a terminal rather than hang when the e-mail is missing', async () => {
    const r = await run(['login', '--server', server.url]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('--email');
  });

  it('saves the token with mode 0600 in a 0700 folder under XDG_CONFIG_HOME', async () => {
    const r = await run(['login', '--server', server.url, '--email', 'installer@example.test', '--password-stdin'], { input: `${DEMO_PASSWORD}\n` });
    expect(r.exitCode, r.stderr).toBe(0);
    expect(r.stdout).toContain('Signed in');
    const folder = path.join(config.dir, 'weir');
    const file = path.join(folder, 'credentials.json');
    expect(statSync(folder).mode & 0o777).toBe(0o700);
    expect(statSync(file).mode & 0o777).toBe(0o600);
    const saved = JSON.parse(readFileSync(file, 'utf8'));
    expect(saved.server).toBe(server.url);
    expect(saved.email).toBe('installer@example.test');
    expect(saved.token.split('.')).toHaveLength(3); // a JWT
  });

  it('whoami names the account, its role and the server', async () => {
    const r = await run(['whoami']);
    expect(r.exitCode).toBe(0);
    expect(r.stdout).toContain('<installer@example.test>, installer, on ' + server.url);
    const j = json((await run(['whoami', '--format', 'json'])).stdout);
    expect(j.user.role).toBe('installer');
    expect(j.tokenFrom).toBe('saved sign-in');
  });

  it('WEIR_SERVER and WEIR_TOKEN stand in for a saved sign-in', async () => {
    const token = await apiToken(server.url, 'lead@example.test');
    const empty = tempDir('weir-sync-empty-');
    try {
      const r = await weir(['whoami', '--format', 'json'], { env: { XDG_CONFIG_HOME: empty.dir, WEIR_SERVER: server.url, WEIR_TOKEN: token } });
      expect(r.exitCode).toBe(0);
      expect(json(r.stdout).user.email).toBe('lead@example.test');
      expect(json(r.stdout).tokenFrom).toBe('WEIR_TOKEN');
      const bad = await weir(['whoami'], { env: { XDG_CONFIG_HOME: empty.dir, WEIR_SERVER: server.url, WEIR_TOKEN: 'not-a-token' } });
      expect(bad.exitCode).toBe(2);
      expect(bad.stderr).toContain('weir login');
    } finally {
      empty.remove();
    }
  });

  it('never sends the saved token to another server', async () => {
    const other = 'http://127.0.0.1:9';
    const r = await run(['whoami', '--server', other]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain(`not signed in to ${other}`);
  });
});

describe('pushing the demo fleet', () => {
  let first: any;

  it('status before any push: every site is new to the server', async () => {
    const r = await run(['status', '--format', 'json', 'examples']);
    expect(r.exitCode).toBe(0);
    expect(json(r.stdout).files.map((f: { local: string }) => f.local)).toEqual(exampleFiles.map(() => 'not-on-server'));
  });

  it('pushes every file, errors and all, and prints a summary table', async () => {
    const r = await run(['push', '-m', 'First survey of the fleet', 'examples']);
    expect(r.exitCode, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/│ file\s+│ site\s+│ revision\s+│ state\s+│ errors\/warnings\s+│ result/);
    expect(r.stdout).toContain(`${exampleFiles.length} files to ${server.url}: ${exampleFiles.length} new, 0 unchanged.`);
    const withErrors = exampleFiles.filter((f) => checkSite(exampleText(f)).counts.error > 0).length;
    expect(r.stdout).toContain(`${withErrors} revisions have errors`);
  });

  it('re-pushing unchanged files creates nothing new', async () => {
    const r = await run(['push', '--format', 'json', 'examples']);
    expect(r.exitCode).toBe(0);
    first = json(r.stdout);
    expect(first.summary).toEqual({ files: exampleFiles.length, created: 0, unchanged: exampleFiles.length, failed: 0 });
    for (const res of first.results) {
      expect(res.revision.number).toBe(1);
      expect(res.revision.state).toBe('pending');
      // the server's count is the same engine's count
      const local = checkSite(exampleText(path.basename(res.path))).counts;
      expect([res.revision.errorCount, res.revision.warningCount, res.revision.infoCount]).toEqual([local.error, local.warning, local.info]);
    }
  });

  it('records the push message with the revision', async () => {
    const r = await run(['log', '--format', 'json', CLEAN_SITE]);
    expect(r.exitCode).toBe(0);
    expect(json(r.stdout).items[0].message).toBe('First survey of the fleet');
  });

  it('--strict pushes nothing when a file has errors (exit 1)', async () => {
    const file = path.join(work.dir, 'heron.yaml');
    writeFileSync(file, `${exampleText('heron-wharf-chandlery.yaml')}# changed\n`);
    const r = await run(['push', '--strict', file]);
    expect(r.exitCode).toBe(1);
    expect(r.stdout).toContain('Nothing pushed');
    expect(r.stdout).toMatch(/heron\.yaml:\d+:\d+: error export-limit-over-agreement/);
    const log = json((await run(['log', '--format', 'json', 'heron-wharf-chandlery'])).stdout);
    expect(log.items).toHaveLength(1);
  });

  it('a file the server refuses (422) shows its findings as file:line:col lines and exits 1', async () => {
    const file = path.join(work.dir, 'not-a-site.yaml');
    writeFileSync(file, 'weir: 1\nsite:\n  id: refused-site\n  name: Refused\n');
    const r = await run(['push', file]);
    expect(r.exitCode).toBe(1);
    expect(r.stdout).toMatch(/not-a-site\.yaml:\d+:\d+: error schema missing required key `agreement`/);
    expect(r.stdout).toContain('failed');
  });

  it('refuses two files for one site in one push (exit 2)', async () => {
    const copy = path.join(work.dir, 'kiln-copy.yaml');
    copyFileSync(path.join(EXAMPLES, `${CLEAN_SITE}.yaml`), copy);
    const r = await run(['push', copy, `examples/${CLEAN_SITE}.yaml`]);
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain(`both describe site ${CLEAN_SITE}`);
  });

  it('an auditor may not push: exit 2 and a clear reason', async () => {
    const token = await apiToken(server.url, 'auditor@example.test');
    const r = await weir(['push', `examples/${CLEAN_SITE}.yaml`], { env: { XDG_CONFIG_HOME: work.dir, WEIR_SERVER: server.url, WEIR_TOKEN: token } });
    expect(r.exitCode).toBe(2);
    expect(r.stderr).toContain('not allowed');
  });
});

describe('after a lead approves a revision', () => {
  let changed: string;
  let leadToken: string;

  beforeAll(async () => {
    leadToken = await apiToken(server.url, 'lead@example.test');
    const site = await api<any>(server.url, leadToken, 'GET', `/api/sites/${CLEAN_SITE}`);
    const review = await api<any>(server.url, leadToken, 'POST', `/api/revisions/${site.body.latest.id}/review`, { decision: 'approve', comment: 'Matches the single-line diagram.' });
    expect(review.status).toBe(200);
    const doc = parseDocument(exampleText(`${CLEAN_SITE}.yaml`));
    doc.setIn(['gateway', 'bus', 'lengthM'], 31);
    changed = path.join(work.dir, `${CLEAN_SITE}.yaml`);
    writeFileSync(changed, doc.toString());
  });

  it('status tells the approved file from a changed copy', async () => {
    const r = await run(['status', '--format', 'json', `examples/${CLEAN_SITE}.yaml`, changed, 'examples/quarry-row-cottage.yaml']);
    expect(r.exitCode).toBe(0);
    const files = json(r.stdout).files;
    expect(files.map((f: { local: string }) => f.local)).toEqual(['same-as-approved', 'differs-from-approved', 'same-as-latest']);
    expect(files[0].approved.number).toBe(1);
    expect(files[2].latest.state).toBe('pending');
    const human = await run(['status', changed]);
    expect(human.stdout).toContain('changed since #1');
    expect(human.stdout).toContain('1 file against');
  });

  it('diff shows the one changed field, as the engine\'s semantic diff has it', async () => {
    const r = await run(['diff', changed]);
    expect(r.exitCode).toBe(0);
    const before = checkSite(exampleText(`${CLEAN_SITE}.yaml`)).data as { gateway: { bus: { lengthM: number } } };
    expect(r.stdout).toContain(`~ gateway.bus.lengthM: ${before.gateway.bus.lengthM} → 31`);
    expect(r.stdout).toContain('1 change');
    const j = json((await run(['diff', '--format', 'json', changed])).stdout);
    expect(j.changes).toEqual(diffSites(before, checkSite(readFileSync(changed, 'utf8')).data));
    expect((await run(['diff', '--exit-code', changed])).exitCode).toBe(1);
    const same = await run(['diff', '--exit-code', `examples/${CLEAN_SITE}.yaml`]);
    expect(same.exitCode).toBe(0);
    expect(same.stdout).toContain('no changes');
  });

  it('diff of a site with nothing approved lists everything as added', async () => {
    const r = await run(['diff', '--format', 'json', 'examples/quarry-row-cottage.yaml']);
    expect(r.exitCode).toBe(0);
    const j = json(r.stdout);
    expect(j.approved).toBeNull();
    expect(j.changes.every((ch: { kind: string }) => ch.kind === 'added')).toBe(true);
  });

  it('pull writes the approved file byte for byte, and will not overwrite a different file without --force', async () => {
    const target = path.join(work.dir, 'pulled.yaml');
    const r = await run(['pull', CLEAN_SITE, '-o', target]);
    expect(r.exitCode, r.stderr).toBe(0);
    expect(readFileSync(target, 'utf8')).toBe(exampleText(`${CLEAN_SITE}.yaml`));
    expect((await run(['pull', CLEAN_SITE, '-o', target])).stdout).toContain('already');
    const refused = await run(['pull', CLEAN_SITE, '-o', changed]);
    expect(refused.exitCode).toBe(2);
    expect(refused.stderr).toContain('--force');
    const out = await run(['pull', CLEAN_SITE, '-o', '-']);
    expect(out.stdout).toBe(exampleText(`${CLEAN_SITE}.yaml`).replace(/\n$/, '')); // execa drops the last newline
  });

  it('pull of a site without an approved revision exits 1; --latest takes the pending one', async () => {
    const none = await run(['pull', 'quarry-row-cottage', '-o', path.join(work.dir, 'q.yaml')]);
    expect(none.exitCode).toBe(1);
    expect(none.stderr).toContain('no approved revision');
    const latest = await run(['pull', 'quarry-row-cottage', '--latest', '-o', path.join(work.dir, 'q.yaml')]);
    expect(latest.exitCode).toBe(0);
    expect(readFileSync(path.join(work.dir, 'q.yaml'), 'utf8')).toBe(exampleText('quarry-row-cottage.yaml'));
    expect((await run(['pull', 'no-such-site'])).exitCode).toBe(2);
    expect((await run(['pull', '../etc/passwd'])).exitCode).toBe(2);
  });

  it('log lists revisions and reviews newest first', async () => {
    const push = await run(['push', '-m', 'Bus re-measured', changed]);
    expect(push.exitCode).toBe(0);
    const r = await run(['log', CLEAN_SITE]);
    expect(r.exitCode).toBe(0);
    const second = r.stdout.indexOf('#2');
    const firstAt = r.stdout.indexOf('#1');
    expect(second).toBeGreaterThan(-1);
    expect(firstAt).toBeGreaterThan(second);
    expect(r.stdout).toContain('"Bus re-measured"');
    expect(r.stdout).toMatch(/✓ approved by Demo Lead <lead@example\.test>, .*: "Matches the single-line diagram\."/);
    const j = json((await run(['log', '--format', 'json', CLEAN_SITE])).stdout);
    expect(j.items.map((i: { number: number; state: string }) => [i.number, i.state])).toEqual([[2, 'pending'], [1, 'approved']]);
    expect((await run(['log', 'no-such-site'])).exitCode).toBe(2);
  });
});

describe('weir audit verify', () => {
  it('says ok for an intact change log, and is closed to installers', async () => {
    const token = await apiToken(server.url, 'auditor@example.test');
    const r = await weir(['audit', 'verify'], { env: { XDG_CONFIG_HOME: work.dir, WEIR_SERVER: server.url, WEIR_TOKEN: token } });
    expect(r.exitCode).toBe(0);
    expect(r.stdout).toMatch(/^ok: .*intact \(\d+ events/);
    expect((await run(['audit', 'verify'])).exitCode).toBe(2);
  });

  it('exits 1 and names the first bad event once an event was altered in the database', async () => {
    const db = new sqlite3.Database(path.join(server.dataDir, 'weir.sqlite'));
    await new Promise<void>((resolve, reject) => db.run("UPDATE audit_events SET details = '{\"tampered\":true}' WHERE seq = 2", (err) => (err ? reject(err) : resolve())));
    await new Promise<void>((resolve) => db.close(() => resolve()));
    const token = await apiToken(server.url, 'auditor@example.test');
    const r = await weir(['audit', 'verify', '--format', 'json'], { env: { XDG_CONFIG_HOME: work.dir, WEIR_SERVER: server.url, WEIR_TOKEN: token } });
    expect(r.exitCode).toBe(1);
    expect(json(r.stdout).firstBadEvent.seq).toBe(2);
    const human = await weir(['audit', 'verify'], { env: { XDG_CONFIG_HOME: work.dir, WEIR_SERVER: server.url, WEIR_TOKEN: token } });
    expect(human.stdout).toContain('first bad event: #2');
  });
});

describe('signing out', () => {
  it('removes the saved sign-in; the next command says so (exit 2)', async () => {
    const r = await run(['logout']);
    expect(r.exitCode).toBe(0);
    expect(r.stdout).toContain('Signed out');
    expect(readdirSync(path.join(config.dir, 'weir'))).toEqual([]);
    const after = await run(['whoami', '--server', server.url]);
    expect(after.exitCode).toBe(2);
    expect(after.stderr).toContain('not signed in');
  });
});
