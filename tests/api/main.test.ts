// The process entry as a user runs it: seed, serve, back up, stop. The server is bundled once by
// scripts/build-server.ts, as for dist/server.js, into tests/.tmp (beside node_modules).
import { execa, type ResultPromise } from 'execa';
import { existsSync } from 'node:fs';
import { copyFile, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import sqlite3 from 'sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { buildServer } from '../../scripts/build-server.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const fixtures = path.join(root, 'tests/api/fixtures');
const bundle = path.join(root, 'tests/.tmp', `server-${process.pid}.js`);
let dataDir: string;
let examplesDir: string;

const run = (args: string[], env: Record<string, string> = {}) =>
  execa('node', [bundle, ...args], { cwd: root, reject: false, env: { WEIR_DATA_DIR: dataDir, WEIR_EXAMPLES_DIR: examplesDir, WEIR_LOG_LEVEL: 'warn', ...env } });

function query<T>(file: string, sql: string): Promise<T[]> {
  return new Promise((resolve, reject) => {
    const db = new sqlite3.Database(file, sqlite3.OPEN_READONLY, (err) => {
      if (err) return reject(err);
      db.all(sql, (e, rows) => db.close(() => (e ? reject(e) : resolve(rows as T[]))));
    });
  });
}

beforeAll(async () => {
  await buildServer(bundle);
  dataDir = await mkdtemp(path.join(os.tmpdir(), 'weir-main-'));
  // A small fleet of our own: two good sites, one with errors, one that fails the schema.
  examplesDir = await mkdtemp(path.join(os.tmpdir(), 'weir-examples-'));
  const base = await readFile(path.join(fixtures, 'mill-lane.yaml'), 'utf8');
  await writeFile(path.join(examplesDir, 'a-good.yaml'), base.replace('id: mill-lane-bakery', 'id: good-one'));
  await writeFile(path.join(examplesDir, 'b-good.yaml'), base.replace('id: mill-lane-bakery', 'id: good-two'));
  await writeFile(path.join(examplesDir, 'c-faulty.yaml'), base.replace('id: mill-lane-bakery', 'id: faulty-one').replace(/ratedPrimaryA: 100/g, 'ratedPrimaryA: 50'));
  await writeFile(path.join(examplesDir, 'd-broken.yaml'), base.replace('weir: 1', 'weir: 2'));
});
afterAll(async () => {
  await rm(bundle, { force: true });
  await rm(`${bundle}.map`, { force: true });
  await rm(dataDir, { recursive: true, force: true });
  await rm(examplesDir, { recursive: true, force: true });
});

describe('seed', () => {
  it('When seeded, then the six demo accounts, the valid sites with history, and a log that verifies; files failing the schema are skipped', async () => {
    const res = await run(['seed']);
    expect(res.exitCode).toBe(0);
    expect(res.stdout).toContain('skipped d-broken.yaml: does not parse or fails the schema');
    expect(res.stdout).toContain('Seeded 6 account(s) and 3 site(s)');
    expect(res.stdout).toContain('weir-demo-2026');
    const db = path.join(dataDir, 'weir.sqlite');
    const users = await query<{ email: string; role: string }>(db, 'SELECT email, role FROM users ORDER BY id');
    expect(users).toEqual([
      { email: 'installer@example.test', role: 'installer' },
      { email: 'installer2@example.test', role: 'installer' },
      { email: 'lead@example.test', role: 'lead' },
      { email: 'lead2@example.test', role: 'lead' },
      { email: 'auditor@example.test', role: 'auditor' },
      { email: 'admin@example.test', role: 'admin' },
    ]);
    const sites = await query<{ id: string; status: string }>(db, 'SELECT id, status FROM sites ORDER BY id');
    // good-one: approved; good-two: approved, then a newer pending push; faulty-one: returned.
    expect(sites).toEqual([
      { id: 'faulty-one', status: 'returned' },
      { id: 'good-one', status: 'approved' },
      { id: 'good-two', status: 'pending' },
    ]);
    const returned = await query<{ comment: string }>(db, "SELECT comment FROM reviews WHERE decision = 'return'");
    expect(returned[0].comment).toMatch(/ct-undersized/);
  });

  it('When seeded again, then nothing changes; with --if-empty it does not even look', async () => {
    const db = path.join(dataDir, 'weir.sqlite');
    const before = await query<{ n: number }>(db, 'SELECT count(*) AS n FROM audit_events');
    const again = await run(['seed']);
    expect(again.stdout).toContain('Seeded 0 account(s) and 0 site(s)');
    const ifEmpty = await run(['seed', '--if-empty']);
    expect(ifEmpty.stdout).toContain('has accounts already: not seeding');
    expect(await query<{ n: number }>(db, 'SELECT count(*) AS n FROM audit_events')).toEqual(before);
  });

  it('When the real demo fleet is seeded, then every state of a revision appears and the chain verifies', async () => {
    const fleetData = await mkdtemp(path.join(os.tmpdir(), 'weir-fleet-'));
    try {
      const res = await run(['seed'], { WEIR_DATA_DIR: fleetData, WEIR_EXAMPLES_DIR: path.join(root, 'examples') });
      expect(res.exitCode).toBe(0);
      const db = path.join(fleetData, 'weir.sqlite');
      const states = (await query<{ state: string }>(db, 'SELECT DISTINCT state FROM revisions')).map((r) => r.state).sort();
      const files = (await readdir(path.join(root, 'examples'))).filter((f) => f.endsWith('.yaml'));
      // With a handful of example files, each scenario of the seed is reached.
      if (files.length >= 8) expect(states).toEqual(['approved', 'pending', 'returned', 'superseded']);
      const serve = startServer({ WEIR_DATA_DIR: fleetData });
      try {
        const url = await serve.url;
        const login = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: JSON.stringify({ email: 'auditor@example.test', password: 'weir-demo-2026' }) });
        const { token } = await login.json();
        const verify = await (await fetch(`${url}/api/audit/verify`, { headers: { Authorization: `Bearer ${token}` } })).json();
        expect(verify.ok).toBe(true);
      } finally {
        await serve.stop();
      }
    } finally {
      await rm(fleetData, { recursive: true, force: true });
    }
  });
});

function startServer(env: Record<string, string> = {}) {
  const child: ResultPromise = run([], { PORT: '0', ...env });
  let out = '';
  const url = new Promise<string>((resolve, reject) => {
    child.stdout!.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /Weir is serving on (http:\/\/127\.0\.0\.1:\d+)/.exec(out);
      if (m && /Data in /.test(out)) resolve(m[1]);
    });
    child.then((r) => reject(new Error(`the server stopped: ${r.stderr || r.stdout}`)), reject);
  });
  return {
    url,
    output: () => out,
    async stop() {
      child.kill('SIGTERM');
      return child;
    },
  };
}

describe('serve', () => {
  it('When started, then it prints the URL and the demo sign-ins, answers health, backs up online and stops cleanly on SIGTERM', async () => {
    const server = startServer();
    const url = await server.url;
    expect(server.output()).toContain('Demo sign-ins, all with the password weir-demo-2026:');
    for (const email of ['installer@example.test', 'installer2@example.test', 'lead@example.test', 'lead2@example.test', 'auditor@example.test', 'admin@example.test']) {
      expect(server.output()).toContain(email);
    }
    const health = await fetch(`${url}/api/health`);
    expect(health.status).toBe(200);
    expect(health.headers.get('x-content-type-options')).toBe('nosniff');

    const target = path.join(dataDir, 'backups', 'weir-backup.sqlite');
    const backup = await run(['backup', target]);
    expect(backup.exitCode).toBe(0);
    expect((await query<{ n: number }>(target, 'SELECT count(*) AS n FROM sites'))[0].n).toBe(3);
    // A second backup to the same file is refused rather than overwritten.
    expect((await run(['backup', target])).exitCode).not.toBe(0);

    const done = await server.stop();
    expect(done.stdout).toContain('Weir has stopped.');
    expect(done.signal ?? null).toBeNull();
  });

  it('When the configuration is bad or the command unknown, then a clear message and exit code 2', async () => {
    const badPort = await run([], { PORT: 'eighty' });
    expect(badPort.exitCode).toBe(2);
    expect(badPort.stderr).toContain('PORT must be a whole number');
    const unknown = await run(['launch']);
    expect(unknown.exitCode).toBe(2);
    expect(unknown.stderr).toContain('usage:');
    const noTarget = await run(['backup']);
    expect(noTarget.exitCode).toBe(2);
  });

  it('When JWT_SECRET is unset, then a secret is generated once in the data folder and kept', async () => {
    expect(existsSync(path.join(dataDir, 'jwt-secret'))).toBe(true);
    const copy = path.join(dataDir, 'jwt-secret.copy');
    await copyFile(path.join(dataDir, 'jwt-secret'), copy);
    await run(['seed']);
    expect(await readFile(path.join(dataDir, 'jwt-secret'), 'utf8')).toBe(await readFile(copy, 'utf8'));
  });
});
