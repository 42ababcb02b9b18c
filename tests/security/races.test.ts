// Races: many requests at the same moment against one revision, one site or one account, first
// inside one process (the app's own write queue), then across two server processes sharing one
// SQLite file (SQLite's write lock and busy timeout), as replicas behind a proxy would.
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../server/auth/permissions.ts';
import { account, accountsByRole, push, review, siteText, startWeir, type Account, type TestWeir } from './support/in-process.ts';
import { FIXTURE } from './support/hostile.ts';
import { getJson, login, pushYaml, serverCommand, startRealServer, type RealServer } from './support/real-server.ts';
import { query } from './support/sqlite.ts';

/** The fixture as site `id`, made distinct by `n` (the meter serial is free text). */
const variant = (id: string, n: number) => FIXTURE.replace('id: mill-lane-bakery', `id: ${id}`).replace('serial: EM-20931', `serial: EM-${n}`);

describe('in one process', () => {
  let weir: TestWeir;
  let accounts: Record<Role, Account>;
  let leads: Account[];
  const rows = <T extends object = Record<string, unknown>>(sql: string, replacements: unknown[] = []): Promise<T[]> => weir.runtime.db.sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

  beforeAll(async () => {
    weir = await startWeir();
    accounts = await accountsByRole(weir);
    leads = [accounts.lead, ...(await Promise.all([1, 2, 3].map((i) => account(weir, 'lead', `lead-${i}`))))];
  });
  afterAll(() => weir?.close());

  it('When 12 reviews of one revision arrive at once, then exactly one decides it and the rest get 409 not-pending', async () => {
    const pushed = await push(weir, accounts.installer, await siteText()).expect(201);
    const id = pushed.body.revision.id as number;
    const attempts = leads.flatMap((lead, i) => [0, 1, 2].map((k) => ((i + k) % 2 ? review(weir, lead, id, 'approve') : review(weir, lead, id, 'return', `not like this (${i}.${k})`))));
    const answers = await Promise.all(attempts.map((a) => a.then((r) => r)));
    const won = answers.filter((r) => r.status === 200);
    expect(won).toHaveLength(1);
    for (const r of answers.filter((x) => x.status !== 200)) {
      expect(r.status).toBe(409);
      expect(r.body.error.code).toBe('not-pending');
    }
    const decision = won[0].body.review.decision as string;
    expect(await rows('SELECT id FROM reviews WHERE revision_id = ?', [id])).toHaveLength(1);
    const events = await rows<{ action: string }>("SELECT action FROM audit_events WHERE revision_id = ? AND action IN ('revision.approved', 'revision.returned')", [id]);
    expect(events).toEqual([{ action: decision === 'approve' ? 'revision.approved' : 'revision.returned' }]);
    const [revision] = await rows<{ state: string }>('SELECT state FROM revisions WHERE id = ?', [id]);
    expect(revision.state).toBe(decision === 'approve' ? 'approved' : 'returned');
  });

  it('When 15 different pushes to one site arrive at once, then each 201 is a stored revision, numbered 1–15, and exactly one is pending', async () => {
    const answers = await Promise.all(Array.from({ length: 15 }, (_, n) => push(weir, n % 2 ? accounts.installer : accounts.lead, variant('race-site', 30000 + n)).then((r) => r)));
    expect(answers.map((r) => r.status)).toEqual(Array(15).fill(201));
    const acknowledged = answers.map((r) => r.body.revision.id as number).sort((a, b) => a - b);
    const stored = await rows<{ id: number; number: number; state: string }>("SELECT id, number, state FROM revisions WHERE site_id = 'race-site' ORDER BY id");
    expect(stored.map((r) => r.id)).toEqual(acknowledged);
    expect(stored.map((r) => r.number).sort((a, b) => a - b)).toEqual(Array.from({ length: 15 }, (_, i) => i + 1));
    const pending = stored.filter((r) => r.state === 'pending');
    expect(pending).toHaveLength(1);
    expect(stored.filter((r) => r.state !== 'pending').every((r) => r.state === 'superseded')).toBe(true);
    // The one left pending is the newest, and the site points at it.
    expect(pending[0].number).toBe(15);
    const [site] = await rows<{ latest_revision_id: number }>("SELECT latest_revision_id FROM sites WHERE id = 'race-site'");
    expect(site.latest_revision_id).toBe(pending[0].id);
  });

  it('When the same text is pushed 10 times at once, then one revision: one 201, nine 200 naming it', async () => {
    const text = variant('same-text-site', 40000);
    const answers = await Promise.all(Array.from({ length: 10 }, () => push(weir, accounts.installer, text).then((r) => r)));
    expect(answers.filter((r) => r.status === 201)).toHaveLength(1);
    expect(answers.filter((r) => r.status === 200 && r.body.created === false)).toHaveLength(9);
    expect(new Set(answers.map((r) => r.body.revision.id)).size).toBe(1);
    expect(await rows("SELECT id FROM revisions WHERE site_id = 'same-text-site'")).toHaveLength(1);
    expect(await rows("SELECT seq FROM audit_events WHERE site_id = 'same-text-site' AND action = 'revision.pushed'")).toHaveLength(1);
  });

  it('When two admins demote each other at the same moment, then one admin is left (409 last-admin for the other)', async () => {
    const second = await account(weir, 'admin', 'admin-two');
    const [a, b] = await Promise.all([
      request(weir.app).patch(`/api/users/${second.id}`).set(accounts.admin.auth).send({ role: 'auditor' }).then((r) => r),
      request(weir.app).patch(`/api/users/${accounts.admin.id}`).set(second.auth).send({ role: 'auditor' }).then((r) => r),
    ]);
    expect([a.status, b.status].sort()).toEqual([200, 409]);
    expect(await rows("SELECT id FROM users WHERE role = 'admin' AND disabled = 0")).toHaveLength(1);
  });

  it('When everything above is done, then the change log still verifies', async () => {
    const res = await request(weir.app).get('/api/audit/verify').set(accounts.auditor.auth).expect(200);
    expect(res.body.ok).toBe(true);
  });
});

describe('across two server processes on one database', () => {
  let dataDir: string;
  let servers: RealServer[] = [];
  let installerTokens: string[];
  let leadTokens: string[];

  beforeAll(async () => {
    dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-race-'));
    const seeded = await serverCommand(['seed'], dataDir);
    expect(seeded.exitCode, seeded.stderr).toBe(0);
    servers = await Promise.all([startRealServer(dataDir), startRealServer(dataDir)]);
    installerTokens = await Promise.all([login(servers[0].url, 'installer@example.test'), login(servers[1].url, 'installer2@example.test')]);
    leadTokens = await Promise.all([login(servers[0].url, 'lead@example.test'), login(servers[1].url, 'lead2@example.test')]);
  });
  afterAll(async () => {
    for (const s of servers) await s.kill('SIGTERM');
    rmSync(dataDir, { recursive: true, force: true });
  });

  const db = () => path.join(dataDir, 'weir.sqlite');

  it('When both processes take pushes to one site at once, then every 201 is stored, nothing else is, and one is pending', async () => {
    const answers = await Promise.all(Array.from({ length: 16 }, (_, n) => pushYaml(servers[n % 2].url, installerTokens[n % 2], variant('shared-site', 50000 + n))));
    // 503 busy is an honest "try again" when the lock stayed taken; it must then store nothing.
    for (const r of answers) expect([201, 503], JSON.stringify(r.body)).toContain(r.status);
    const acknowledged = answers.filter((r) => r.status === 201).map((r) => r.body.revision.id).sort((a, b) => a - b);
    expect(acknowledged.length).toBeGreaterThan(0);
    const stored = await query<{ id: number; number: number; state: string }>(db(), "SELECT id, number, state FROM revisions WHERE site_id = 'shared-site' ORDER BY id");
    expect(stored.map((r) => r.id)).toEqual(acknowledged);
    expect(new Set(stored.map((r) => r.number)).size).toBe(stored.length);
    expect(stored.filter((r) => r.state === 'pending')).toHaveLength(1);
  });

  it('When both processes take the same text at once, then one revision', async () => {
    const text = variant('shared-same', 60000);
    const answers = await Promise.all(Array.from({ length: 10 }, (_, n) => pushYaml(servers[n % 2].url, installerTokens[n % 2], text)));
    for (const r of answers) expect([200, 201, 503]).toContain(r.status);
    expect(answers.filter((r) => r.status === 201)).toHaveLength(1);
    expect(new Set(answers.filter((r) => r.status < 300).map((r) => r.body.revision.id)).size).toBe(1);
    expect(await query(db(), "SELECT id FROM revisions WHERE site_id = 'shared-same'")).toHaveLength(1);
  });

  it('When two leads on two processes review one revision at once, then exactly one decision', async () => {
    const pushed = await pushYaml(servers[0].url, installerTokens[0], variant('shared-review', 70000));
    expect(pushed.status).toBe(201);
    const id = pushed.body.revision.id;
    const answers = await Promise.all(Array.from({ length: 8 }, async (_, n) => {
      const res = await fetch(`${servers[n % 2].url}/api/revisions/${id}/review`, {
        method: 'POST',
        headers: { authorization: `Bearer ${leadTokens[n % 2]}`, 'content-type': 'application/json' },
        body: JSON.stringify(n % 3 ? { decision: 'approve' } : { decision: 'return', comment: 'check the CT ratio' }),
      });
      return { status: res.status, body: (await res.json()) as { error?: { code: string } } };
    }));
    expect(answers.filter((r) => r.status === 200)).toHaveLength(1);
    for (const r of answers.filter((x) => x.status !== 200)) expect([409, 503]).toContain(r.status);
    expect(await query(db(), 'SELECT id FROM reviews WHERE revision_id = ?', [id])).toHaveLength(1);
  });

  it('When both processes have written, then the one change log verifies from either', async () => {
    for (const [i, s] of servers.entries()) {
      const res = await getJson<{ ok: boolean; events: number }>(s.url, leadTokens[i], '/api/audit/verify');
      expect(res.body.ok, JSON.stringify(res.body)).toBe(true);
    }
    expect(servers.every((s) => s.alive())).toBe(true);
  });
});
