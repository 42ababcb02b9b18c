// Bad input never gets a 5xx, and the write lock of SQLite is really what orders writers.
import fc from 'fast-check';
import sqlite3 from 'sqlite3';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { account, push, review, siteText, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;
let lead2: Account;
let admin: Account;
let target: Account;
let revisionId: number;
let validText: string;

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead, lead2, admin, target] = await Promise.all([account(weir, 'installer'), account(weir, 'lead'), account(weir, 'lead', 'lead2'), account(weir, 'admin'), account(weir, 'installer', 'target')]);
  validText = await siteText();
  revisionId = (await push(weir, installer, validText).expect(201)).body.revision.id;
});
afterAll(() => weir.close());

const api = () => request(weir.app);

/** A 4xx (or a success) in the error shape: what every answer to bad input must be. */
function expectClientAnswer(res: request.Response) {
  expect(res.status).toBeLessThan(500);
  if (res.status >= 400) expect(typeof res.body.error?.code).toBe('string');
}

describe('bad input never gets a 5xx', () => {
  it('When arbitrary text is pushed as a site file, then 2xx or 4xx', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ unit: 'binary', maxLength: 400 }), async (text) => {
        expectClientAnswer(await push(weir, installer, text));
      }),
      { numRuns: 40 },
    );
  });

  it('When a valid site file is cut or spliced at random, then 2xx or 4xx', async () => {
    await fc.assert(
      fc.asyncProperty(fc.nat(validText.length), fc.nat(validText.length), fc.string({ maxLength: 6 }), async (a, b, insert) => {
        const [from, to] = a < b ? [a, b] : [b, a];
        const text = validText.slice(0, from) + insert + validText.slice(Math.min(to, from + 40));
        expectClientAnswer(await push(weir, lead, text));
      }),
      { numRuns: 40 },
    );
  });

  it('When arbitrary JSON is sent to the JSON routes, then 2xx or 4xx', async () => {
    const routes: [string, string, Account][] = [
      ['post', '/api/auth/login', installer],
      ['post', `/api/revisions/${revisionId}/review`, lead2],
      ['post', '/api/users', admin],
      ['patch', `/api/users/${target.id}`, admin],
      ['post', '/api/me/password', lead],
    ];
    await fc.assert(
      fc.asyncProperty(fc.constantFrom(...routes), fc.jsonValue({ maxDepth: 3 }), async ([method, path, who], body) => {
        const req = method === 'post' ? api().post(path) : api().patch(path);
        expectClientAnswer(await req.set(who.auth).set('Content-Type', 'application/json').send(JSON.stringify(body)));
      }),
      { numRuns: 60 },
    );
  });

  it('When arbitrary query strings are sent to the list routes, then 2xx or 4xx', async () => {
    const keys = ['page', 'limit', 'q', 'state', 'status', 'sort', 'site', 'actor', 'action', 'from', 'to', 'message'];
    await fc.assert(
      fc.asyncProperty(fc.constantFrom('/api/sites', '/api/audit', '/api/audit.csv'), fc.array(fc.tuple(fc.constantFrom(...keys), fc.string({ unit: 'binary', maxLength: 20 })), { maxLength: 5 }), async (path, pairs) => {
        const qs = pairs.map(([k, v]) => `${k}=${encodeURIComponent(v)}`).join('&');
        expectClientAnswer(await api().get(`${path}?${qs}`).set(lead.auth));
      }),
      { numRuns: 60 },
    );
  });

  it('When path ids are arbitrary, then 404 or another 4xx', async () => {
    await fc.assert(
      fc.asyncProperty(fc.string({ maxLength: 30 }), async (raw) => {
        const id = encodeURIComponent(raw) || 'x';
        for (const path of [`/api/sites/${id}`, `/api/sites/${id}/revisions`, `/api/sites/${id}/attachments`, `/api/revisions/${id}`, `/api/attachments/${id}/content`]) {
          expectClientAnswer(await api().get(path).set(lead.auth));
        }
      }),
      { numRuns: 25 },
    );
  });
});

describe('the SQLite write lock', () => {
  it('When another connection holds the write lock, then a review waits for it and then succeeds', async () => {
    const text = validText.replace('id: mill-lane-bakery', 'id: locked-site');
    const pushed = await push(weir, installer, text).expect(201);
    const other = new sqlite3.Database(weir.config.databaseFile);
    const exec = (sql: string) => new Promise<void>((resolve, reject) => other.exec(sql, (err) => (err ? reject(err) : resolve())));
    await exec('BEGIN IMMEDIATE');
    let settled = false;
    const pending = review(weir, lead, pushed.body.revision.id, 'approve').then((res) => {
      settled = true;
      return res;
    });
    await new Promise((r) => setTimeout(r, 400));
    // Still waiting: the review's IMMEDIATE transaction cannot begin while the lock is held.
    expect(settled).toBe(false);
    await exec('COMMIT');
    const res = await pending;
    expect(res.status).toBe(200);
    expect(res.body.revision.state).toBe('approved');
    await new Promise<void>((resolve) => other.close(() => resolve()));
  });
});
