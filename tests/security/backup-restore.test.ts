// Backup while serving, then restore: `node dist/server.js backup <file>` (what `npm run backup`
// runs) copies the live database while pushes are in flight. The copy must pass
// `PRAGMA integrity_check`, open as the database of a second server, verify its change log and
// hold every push acknowledged before the backup began.
import { execa } from 'execa';
import { existsSync, mkdirSync, mkdtempSync, readdirSync, renameSync, rmSync, statSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import sqlite3 from 'sqlite3';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { backupDatabase } from '../../server/backup.ts';
import { FIXTURE } from './support/hostile.ts';
import { getJson, login, pushYaml, ROOT, SERVER_JS, serverCommand, serverEnv, sleep, startRealServer, type RealServer } from './support/real-server.ts';
import { integrityCheck, query } from './support/sqlite.ts';

const variant = (n: number) => FIXTURE.replace('id: mill-lane-bakery', `id: backup-${n % 4}`).replace('serial: EM-20931', `serial: EM-${200000 + n}`);

let work: string;
let liveDir: string;
let live: RealServer;
let restored: RealServer | null = null;
let installer: string;

beforeAll(async () => {
  work = mkdtempSync(path.join(os.tmpdir(), 'weir-backup-'));
  liveDir = path.join(work, 'live');
  mkdirSync(liveDir);
  expect((await serverCommand(['seed'], liveDir)).exitCode).toBe(0);
  live = await startRealServer(liveDir);
  installer = await login(live.url, 'installer@example.test');
});
afterAll(async () => {
  await live?.kill('SIGTERM');
  await restored?.kill('SIGTERM');
  rmSync(work, { recursive: true, force: true });
});

describe('online backup', () => {
  let copy: string;
  const acknowledgedBefore: number[] = [];
  const acknowledgedDuring: number[] = [];
  let counter = 0;

  it('When a backup is taken while pushes are in flight, then it succeeds and the server never stops answering', async () => {
    for (let i = 0; i < 8; i++) {
      const res = await pushYaml(live.url, installer, variant(counter++));
      expect(res.status).toBe(201);
      acknowledgedBefore.push(res.body.revision.id);
    }
    copy = path.join(work, 'copies', 'weir-backup.sqlite');
    let backingUp = true;
    const failures: string[] = [];
    const pusher = async () => {
      while (backingUp) {
        const res = await pushYaml(live.url, installer, variant(counter++));
        if (res.status === 201) acknowledgedDuring.push(res.body.revision.id);
        else failures.push(`${res.status} ${JSON.stringify(res.body)}`);
      }
    };
    const pushers = [pusher(), pusher()];
    const backup = await serverCommand(['backup', copy], liveDir);
    backingUp = false;
    await Promise.all(pushers);
    expect(backup.exitCode, backup.stderr).toBe(0);
    expect(backup.stdout).toContain('Backed up');
    expect(backup.stderr).not.toMatch(/^\s+at /m);
    expect(failures).toEqual([]);
    expect(acknowledgedDuring.length, 'pushes kept being served during the backup').toBeGreaterThan(0);
    expect(live.alive()).toBe(true);
  });

  it('When the copy is opened, then it passes integrity_check and holds every push acknowledged before the backup', async () => {
    expect(await integrityCheck(copy)).toEqual(['ok']);
    const ids = new Set((await query<{ id: number }>(copy, 'SELECT id FROM revisions')).map((r) => r.id));
    expect(acknowledgedBefore.filter((id) => !ids.has(id))).toEqual([]);
    // A snapshot, not a mixture: each revision in it has its event, each event's revision is in it.
    const orphans = await query(copy, "SELECT r.id FROM revisions r LEFT JOIN audit_events a ON a.revision_id = r.id AND a.action = 'revision.pushed' WHERE a.seq IS NULL");
    expect(orphans).toEqual([]);
    const dangling = await query(copy, "SELECT a.seq FROM audit_events a LEFT JOIN revisions r ON r.id = a.revision_id WHERE a.action = 'revision.pushed' AND r.id IS NULL");
    expect(dangling).toEqual([]);
    // The copy is one self-contained file: no -wal beside it that it would need.
    expect(existsSync(`${copy}-wal`)).toBe(false);
  });

  it('When the copy is restored as the database of a new server, then it serves, signs in and its change log verifies', async () => {
    const restoreDir = path.join(work, 'restored');
    mkdirSync(restoreDir);
    renameSync(copy, path.join(restoreDir, 'weir.sqlite'));
    restored = await startRealServer(restoreDir);
    const auditor = await login(restored.url, 'auditor@example.test');
    const verify = await getJson<{ ok: boolean; events: number }>(restored.url, auditor, '/api/audit/verify');
    expect(verify.status).toBe(200);
    expect(verify.body.ok, JSON.stringify(verify.body)).toBe(true);
    const [{ n }] = await query<{ n: number }>(path.join(restoreDir, 'weir.sqlite'), 'SELECT COUNT(*) AS n FROM audit_events');
    expect(verify.body.events).toBe(n);
    const sites = await getJson<{ total: number }>(restored.url, auditor, '/api/sites');
    expect(sites.body.total).toBe(4);
    // It goes on from where the copy stopped.
    const next = await pushYaml(restored.url, await login(restored.url, 'installer@example.test'), variant(counter++));
    expect(next.status).toBe(201);
  });

  it('When an operator runs `npm run backup -- <file>` against the live folder, then the same consistent copy', async () => {
    const target = path.join(work, 'npm-backup.sqlite');
    const res = await execa('npm', ['run', '--silent', 'backup', '--', target], { cwd: ROOT, env: serverEnv(liveDir), reject: false, timeout: 60_000 });
    expect(res.exitCode, res.stderr).toBe(0);
    expect(await integrityCheck(target)).toEqual(['ok']);
    const [{ n }] = await query<{ n: number }>(target, 'SELECT COUNT(*) AS n FROM revisions');
    expect(n).toBeGreaterThanOrEqual(acknowledgedBefore.length);
  });

  it('When the target exists already or no database is there, then a clear message and a non-zero exit, nothing overwritten', async () => {
    const existing = path.join(work, 'existing.sqlite');
    expect((await serverCommand(['backup', existing], liveDir)).exitCode).toBe(0);
    const again = await serverCommand(['backup', existing], liveDir);
    expect(again.exitCode).not.toBe(0);
    expect(again.stderr).toMatch(/exists already/);
    expect(again.stderr).not.toMatch(/^\s+at /m);
    expect(await integrityCheck(existing)).toEqual(['ok']);

    const empty = path.join(work, 'empty');
    mkdirSync(empty);
    const none = await serverCommand(['backup', path.join(work, 'x.sqlite')], empty);
    expect(none.exitCode).not.toBe(0);
    expect(none.stderr).toMatch(/no database/);
    expect(none.stderr).not.toMatch(/^\s+at /m);
  });
});

describe('a backup cut short', () => {
  let bigDir: string;

  beforeAll(async () => {
    // Any SQLite file will do for the copy itself: ~80 MB of random rows, so the copy takes a while.
    bigDir = path.join(work, 'big');
    mkdirSync(bigDir);
    const file = path.join(bigDir, 'weir.sqlite');
    await new Promise<void>((resolve, reject) => {
      const db = new sqlite3.Database(file, (err) => {
        if (err) return reject(err);
        db.exec('PRAGMA journal_mode = WAL; CREATE TABLE t (b BLOB); WITH RECURSIVE c(x) AS (SELECT 1 UNION ALL SELECT x + 1 FROM c WHERE x < 80000) INSERT INTO t SELECT randomblob(1000) FROM c;', (e) => db.close(() => (e ? reject(e) : resolve())));
      });
    });
  });

  it('When the backup process is killed half-way, then no file is left under the name asked for', async () => {
    const target = path.join(work, 'cut', 'weir-backup.sqlite');
    const child = execa('node', [SERVER_JS, 'backup', target], { cwd: ROOT, env: serverEnv(bigDir), reject: false });
    // Kill it once the copy has begun (a temporary file appears beside the target).
    const deadline = Date.now() + 20_000;
    while (Date.now() < deadline && !(existsSync(path.dirname(target)) && readdirSync(path.dirname(target)).length > 0)) await sleep(5);
    child.kill('SIGKILL');
    const result = await child;
    expect(result.exitCode === 0, 'the backup finished before it could be killed: make the file bigger').toBe(false);
    expect(existsSync(target)).toBe(false);
  });

  it('When a backup runs, then the target name appears only once the copy is whole, and nothing temporary is left', async () => {
    const target = path.join(work, 'whole', 'weir-backup.sqlite');
    const sizes: number[] = [];
    let running = true;
    const watcher = (async () => {
      while (running) {
        try {
          sizes.push(statSync(target).size);
        } catch {
          // not there yet
        }
        await sleep(2);
      }
    })();
    await backupDatabase(path.join(bigDir, 'weir.sqlite'), target);
    running = false;
    await watcher;
    const final = statSync(target).size;
    expect(final).toBeGreaterThan(50 * 1024 * 1024);
    expect(sizes.filter((n) => n !== final), 'the target was seen before it was complete').toEqual([]);
    expect(readdirSync(path.dirname(target))).toEqual(['weir-backup.sqlite']);
    expect(await integrityCheck(target)).toEqual(['ok']);
  });
});

