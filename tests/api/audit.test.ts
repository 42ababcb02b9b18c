import sqlite3 from 'sqlite3';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { account, push, review, siteText, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;
let lead2: Account;
let auditor: Account;
let admin: Account;
let revisionId: number;

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead, lead2, auditor, admin] = await Promise.all([
    account(weir, 'installer'),
    account(weir, 'lead'),
    account(weir, 'lead', 'lead2'),
    account(weir, 'auditor'),
    account(weir, 'admin'),
  ]);
  const pushed = await push(weir, installer, await siteText(), 'First design').expect(201);
  revisionId = pushed.body.revision.id;
  await review(weir, lead, revisionId, 'approve', 'Fine by me').expect(200);
});
afterAll(() => weir.close());

const api = () => request(weir.app);

/** Runs SQL on the database file through a connection of its own, as someone with file access could. */
async function tamper(sql: string, params: unknown[] = []) {
  const db = new sqlite3.Database(weir.config.databaseFile);
  try {
    await new Promise<void>((resolve, reject) => db.run(sql, params, (err) => (err ? reject(err) : resolve())));
  } finally {
    await new Promise<void>((resolve) => db.close(() => resolve()));
  }
}

describe('the change log', () => {
  it('When things happen, then each state change is one event with actor, site and revision', async () => {
    const res = await api().get('/api/audit').query({ limit: 200 }).set(auditor.auth).expect(200);
    const actions = res.body.items.map((e: { action: string }) => e.action).reverse();
    // Oldest first: 5 accounts, 5 sign-ins, then the push and the approval.
    expect(actions).toEqual([...Array(5).fill('user.created'), ...Array(5).fill('auth.login'), 'site.created', 'revision.pushed', 'revision.approved']);
    expect(res.body.total).toBe(13);
    const approved = res.body.items[0];
    expect(approved).toMatchObject({ seq: 13, action: 'revision.approved', actor: { id: lead.id, email: lead.email }, siteId: 'mill-lane-bakery', revisionId, details: { comment: 'Fine by me' } });
    expect(approved.at).toMatch(/^\d{4}-\d\d-\d\dT\d\d:\d\d:\d\d\.\d{3}Z$/);
    expect(approved.prevHash).toBe(res.body.items[1].hash);
  });

  it('When filtered by site, actor, action, time or page, then only those events come back', async () => {
    const bySite = await api().get('/api/audit').query({ site: 'mill-lane-bakery' }).set(lead2.auth).expect(200);
    expect(bySite.body.items.map((e: { action: string }) => e.action)).toEqual(['revision.approved', 'revision.pushed', 'site.created']);
    const byActor = await api().get('/api/audit').query({ actor: String(installer.id), action: 'revision.*' }).set(admin.auth).expect(200);
    expect(byActor.body.items.map((e: { action: string }) => e.action)).toEqual(['revision.pushed']);
    const byEmail = await api().get('/api/audit').query({ actor: lead.email, action: 'revision.approved' }).set(admin.auth).expect(200);
    expect(byEmail.body.total).toBe(1);
    const future = await api().get('/api/audit').query({ from: '2999-01-01' }).set(auditor.auth).expect(200);
    expect(future.body.total).toBe(0);
    const past = await api().get('/api/audit').query({ to: '2000-01-01T00:00:00Z' }).set(auditor.auth).expect(200);
    expect(past.body.total).toBe(0);
    const page = await api().get('/api/audit').query({ limit: 5, page: 3 }).set(auditor.auth).expect(200);
    expect(page.body).toMatchObject({ total: 13, page: 3, limit: 5 });
    expect(page.body.items.map((e: { seq: number }) => e.seq)).toEqual([3, 2, 1]);
  });

  it('When the query is bad, then 400 invalid-query', async () => {
    for (const query of [{ from: 'yesterday' }, { page: 0 }, { limit: 'all' }, { to: '2026-13-45' }]) {
      expect((await api().get('/api/audit').query(query).set(auditor.auth).expect(400)).body.error.code).toBe('invalid-query');
    }
  });

  it('When exported, then CSV with a header and one row per event, in chain order', async () => {
    const res = await api().get('/api/audit.csv').set(auditor.auth).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="weir-change-log-\d{4}-\d\d-\d\d\.csv"$/);
    const lines = res.text.trimEnd().split('\r\n');
    expect(lines[0]).toBe('seq,at,actor_id,actor_email,action,site_id,revision_id,details,prev_hash,hash');
    expect(lines).toHaveLength(14);
    expect(lines[1].startsWith('1,')).toBe(true);
    expect(lines[13]).toContain('revision.approved');
    // Details are JSON in one quoted cell.
    expect(lines[13]).toContain('"{""number"":1,""comment"":""Fine by me""');
    const filtered = await api().get('/api/audit.csv').query({ action: 'revision.approved' }).set(lead.auth).expect(200);
    expect(filtered.text.trimEnd().split('\r\n')).toHaveLength(2);
  });

  it('When an installer asks for the log, then 403; without a token, then 401', async () => {
    for (const path of ['/api/audit', '/api/audit.csv', '/api/audit/verify']) {
      expect((await api().get(path).set(installer.auth).expect(403)).body.error.code).toBe('forbidden');
      await api().get(path).expect(401);
    }
  });
});

describe('verifying the chain', () => {
  it('When nothing was touched, then verify says ok for every event; when a row is altered in SQLite, then it names that event', async () => {
    const ok = await api().get('/api/audit/verify').set(auditor.auth).expect(200);
    expect(ok.body).toMatchObject({ ok: true, events: 13, headHash: expect.stringMatching(/^[0-9a-f]{64}$/) });
    expect(ok.body.firstBadEvent).toBeUndefined();

    // Someone softens the approval comment behind the application's back.
    await tamper("UPDATE audit_events SET details = json_set(details, '$.comment', 'Approved without checking') WHERE seq = 13");
    const altered = await api().get('/api/audit/verify').set(lead.auth).expect(200);
    expect(altered.body).toMatchObject({ ok: false, events: 13, firstBadEvent: { seq: 13, reason: 'hash-mismatch' } });
  });

  it('When an altered row also gets a recomputed hash, then the next event no longer follows it', async () => {
    await tamper("UPDATE audit_events SET hash = (CASE WHEN substr(hash, 1, 1) = 'f' THEN 'e' ELSE 'f' END) || substr(hash, 2) WHERE seq = 12");
    const res = await api().get('/api/audit/verify').set(admin.auth).expect(200);
    expect(res.body.firstBadEvent).toMatchObject({ seq: 12, reason: 'hash-mismatch' });
  });

  it('When an event is deleted, then verify reports the gap before the next one', async () => {
    await tamper('DELETE FROM audit_events WHERE seq = 4');
    const res = await api().get('/api/audit/verify').set(auditor.auth).expect(200);
    expect(res.body).toMatchObject({ ok: false, firstBadEvent: { seq: 5, reason: 'gap' } });
    expect(res.body.firstBadEvent.message).toContain('event 4 is missing');
  });

  it('When details are no longer JSON, then the log still lists and verify names the event', async () => {
    await tamper("UPDATE audit_events SET details = 'not json' WHERE seq = 2");
    const res = await api().get('/api/audit/verify').set(auditor.auth).expect(200);
    expect(res.body.firstBadEvent).toMatchObject({ seq: 2, reason: 'unreadable' });
    const list = await api().get('/api/audit').query({ limit: 200 }).set(auditor.auth).expect(200);
    expect(list.body.items.find((e: { seq: number }) => e.seq === 2).details).toBe('not json');
  });
});
