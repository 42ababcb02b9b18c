// Tamper evidence: someone with write access to the SQLite file alters, deletes, reorders or
// forges change-log rows behind the application's back. `GET /api/audit/verify` and the auditor's
// `weir audit verify` must both say the log is broken and name the first bad event. Each case
// starts from a fresh copy of the untouched log (copied back in from a pristine file).
import { execa } from 'execa';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eventHash } from '../../server/audit/audit.service.ts';
import { FIXTURE } from './support/hostile.ts';
import { assertCliBuilt, getJson, login, pushYaml, serverCommand, startRealServer, WEIR_JS, type RealServer } from './support/real-server.ts';
import { exec, query } from './support/sqlite.ts';

interface Verify {
  ok: boolean;
  events: number;
  headHash: string;
  firstBadEvent?: { seq: number; reason: string; message: string };
}

let dataDir: string;
let pristine: string;
let server: RealServer;
let auditor: string;
let untouched: Verify;
const db = () => path.join(dataDir, 'weir.sqlite');

const verifyApi = async () => (await getJson<Verify>(server.url, auditor, '/api/audit/verify')).body;
const verifyCli = (format?: 'json') =>
  execa('node', [WEIR_JS, 'audit', 'verify', ...(format ? ['--format', format] : [])], {
    reject: false,
    timeout: 30_000,
    env: { WEIR_SERVER: server.url, WEIR_TOKEN: auditor, NO_COLOR: '1', XDG_CONFIG_HOME: dataDir },
    extendEnv: true,
  });

/** Puts the change log back as it was: a fresh copy of the pristine rows for the next case. */
async function restoreLog() {
  await exec(db(), `ATTACH DATABASE '${pristine.replaceAll("'", "''")}' AS pristine; DELETE FROM audit_events; INSERT INTO audit_events SELECT * FROM pristine.audit_events`);
  expect((await verifyApi()).ok).toBe(true);
}

interface Row {
  seq: number; at: string; actor_id: number | null; actor_email: string | null; action: string;
  site_id: string | null; revision_id: number | null; details: string; prev_hash: string; hash: string;
}
const row = async (seq: number) => (await query<Row>(db(), 'SELECT * FROM audit_events WHERE seq = ?', [seq]))[0];

/** The hash a row ought to have, computed as the server does (what a careful forger would do). */
const hashOf = (r: Row, prevHash: string) =>
  eventHash(prevHash, { seq: r.seq, at: r.at, actorId: r.actor_id, actorEmail: r.actor_email, action: r.action, siteId: r.site_id, revisionId: r.revision_id, details: JSON.parse(r.details) });

beforeAll(async () => {
  assertCliBuilt();
  dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-tamper-'));
  expect((await serverCommand(['seed'], dataDir)).exitCode).toBe(0);
  server = await startRealServer(dataDir);
  auditor = await login(server.url, 'auditor@example.test');
  // A short history: pushes, a supersede, an approval, a return.
  const installer = await login(server.url, 'installer@example.test');
  const lead = await login(server.url, 'lead@example.test');
  const site = (id: string, serial: string) => FIXTURE.replace('id: mill-lane-bakery', `id: ${id}`).replace('serial: EM-20931', `serial: ${serial}`);
  for (const text of [site('tamper-a', 'EM-1'), site('tamper-a', 'EM-2'), site('tamper-b', 'EM-3')]) expect((await pushYaml(server.url, installer, text)).status).toBe(201);
  const revisions = await query<{ id: number; site_id: string; state: string }>(db(), "SELECT id, site_id, state FROM revisions WHERE state = 'pending' ORDER BY id");
  const decide = (id: number, body: object) => fetch(`${server.url}/api/revisions/${id}/review`, { method: 'POST', headers: { authorization: `Bearer ${lead}`, 'content-type': 'application/json' }, body: JSON.stringify(body) });
  expect((await decide(revisions[0].id, { decision: 'approve', comment: 'CTs and fail-safe checked on site' })).status).toBe(200);
  expect((await decide(revisions[1].id, { decision: 'return', comment: 'photo of the meter missing' })).status).toBe(200);
  untouched = await verifyApi();
  expect(untouched.ok).toBe(true);
  expect(untouched.events).toBeGreaterThanOrEqual(12);
  pristine = path.join(dataDir, 'pristine.sqlite');
  // A consistent copy of the live file, taken the way an operator would.
  const backup = await serverCommand(['backup', pristine], dataDir);
  expect(backup.exitCode, backup.stderr).toBe(0);
});
afterAll(async () => {
  await server?.kill('SIGTERM');
  rmSync(dataDir, { recursive: true, force: true });
});

describe('an untouched log', () => {
  it('When nothing was touched, then the API says ok and `weir audit verify` exits 0 saying it is intact', async () => {
    const cli = await verifyCli();
    expect(cli.exitCode, cli.stderr).toBe(0);
    expect(cli.stdout).toMatch(/intact/);
    expect(cli.stdout).toContain(String(untouched.events));
    // The head hash, for the auditor to write down (it is what shows a cut-off tail).
    expect(cli.stdout).toContain(untouched.headHash);
  });
});

describe('a tampered log', () => {
  /** Each case tampers and returns the seq the verdict must name. */
  const cases: { name: string; tamper: () => Promise<number>; reason: RegExp; message?: RegExp }[] = [
    {
      name: 'an approval comment is reworded',
      tamper: async () => {
        const [{ seq }] = await query<{ seq: number }>(db(), "SELECT seq FROM audit_events WHERE action = 'revision.approved'");
        await exec(db(), `UPDATE audit_events SET details = json_set(details, '$.comment', 'approved without a site visit') WHERE seq = ${seq}`);
        return seq;
      },
      reason: /^hash-mismatch$/,
    },
    {
      name: 'the actor of an event is changed to someone else',
      tamper: async () => {
        await exec(db(), "UPDATE audit_events SET actor_email = 'lead2@example.test' WHERE seq = 5");
        return 5;
      },
      reason: /^hash-mismatch$/,
    },
    {
      name: 'an event is altered and given a freshly computed hash of its own',
      tamper: async () => {
        const r = await row(6);
        const forged = { ...r, details: JSON.stringify({ ...JSON.parse(r.details), forged: true }) };
        await exec(db(), `UPDATE audit_events SET details = '${forged.details.replaceAll("'", "''")}', hash = '${hashOf(forged, r.prev_hash)}' WHERE seq = 6`);
        // Event 6 is self-consistent now; event 7 no longer follows it.
        return 7;
      },
      reason: /^prev-hash-mismatch$/,
    },
    {
      name: 'an event is deleted',
      tamper: async () => {
        await exec(db(), 'DELETE FROM audit_events WHERE seq = 4');
        return 5;
      },
      reason: /^gap$/,
      message: /event 4 is missing/,
    },
    {
      name: 'two events swap places (their seq is exchanged)',
      tamper: async () => {
        await exec(db(), 'UPDATE audit_events SET seq = -1 WHERE seq = 8; UPDATE audit_events SET seq = 8 WHERE seq = 9; UPDATE audit_events SET seq = 9 WHERE seq = -1');
        return 8;
      },
      reason: /^(hash-mismatch|prev-hash-mismatch)$/,
    },
    {
      name: 'an event is forged onto the end without knowing the chain',
      tamper: async () => {
        await exec(db(), `INSERT INTO audit_events (seq, at, actor_id, actor_email, action, site_id, revision_id, details, prev_hash, hash) SELECT MAX(seq) + 1, '2026-01-01T00:00:00.000Z', 1, 'admin@example.test', 'revision.approved', 'tamper-b', 3, '{}', '${'0'.repeat(64)}', '${'f'.repeat(64)}' FROM audit_events`);
        return untouched.events + 1;
      },
      reason: /^prev-hash-mismatch$/,
    },
  ];

  for (const c of cases) {
    it(`When ${c.name}, then the API and \`weir audit verify\` both say broken and name the first bad event`, async () => {
      const seq = await c.tamper();
      try {
        const api = await verifyApi();
        expect(api.ok).toBe(false);
        expect(api.firstBadEvent?.seq).toBe(seq);
        expect(api.firstBadEvent?.reason).toMatch(c.reason);
        if (c.message) expect(api.firstBadEvent?.message).toMatch(c.message);

        const human = await verifyCli();
        expect(human.exitCode, human.stderr).toBe(1);
        expect(human.stdout).toMatch(/broken/);
        expect(human.stdout).toContain(`#${seq}`);
        const json = await verifyCli('json');
        expect(json.exitCode).toBe(1);
        expect(JSON.parse(json.stdout)).toMatchObject({ ok: false, firstBadEvent: { seq } });
      } finally {
        await restoreLog();
      }
    });
  }

  it('When the newest events are cut off, then the chain alone still verifies, but its head hash and count differ from the ones written down', async () => {
    // A hash chain cannot see a truncated tail by itself: that is why verify reports headHash
    // and events, for the auditor to record and compare next time.
    await exec(db(), `DELETE FROM audit_events WHERE seq > ${untouched.events - 2}`);
    try {
      const api = await verifyApi();
      expect(api.ok).toBe(true);
      expect(api.events).toBe(untouched.events - 2);
      expect(api.headHash).not.toBe(untouched.headHash);
      const json = JSON.parse((await verifyCli('json')).stdout) as Verify;
      expect(json.headHash).toBe(api.headHash);
      const human = await verifyCli();
      expect(human.stdout).not.toContain(untouched.headHash);
      expect(human.stdout).toContain(`#${untouched.events - 2}`);
    } finally {
      await restoreLog();
    }
  });
});
