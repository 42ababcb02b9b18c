// The sites list serves a cached answer only while nothing has been committed since it was made
// (server/sites/sites.service.ts, PRAGMA data_version). What must hold: no answer is ever older
// than the last change, whoever made it: this process, another process on the same file, or a
// hand on the database.
import sqlite3 from 'sqlite3';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { account, push, review, siteText, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead] = await Promise.all([account(weir, 'installer'), account(weir, 'lead')]);
});
afterAll(() => weir.close());

const list = async (query = 'limit=50') => (await request(weir.app).get(`/api/sites?${query}`).set(lead.auth).expect(200).expect('Content-Type', /application\/json/)).body as { items: { id: string; name: string; status: string }[]; total: number };

/** A second connection to the file, as another server process would have. */
function otherConnection() {
  const db = new sqlite3.Database(weir.config.databaseFile);
  return {
    run: (sql: string, params: unknown[] = []) => new Promise<void>((resolve, reject) => db.run(sql, params, (err) => (err ? reject(err) : resolve()))),
    close: () => new Promise<void>((resolve) => db.close(() => resolve())),
  };
}

describe('the cached sites list', () => {
  it('When this process pushes, then the very next list shows it', async () => {
    expect((await list()).total).toBe(0);
    for (const [i, id] of ['cache-a', 'cache-b'].entries()) {
      await push(weir, installer, await siteText([['id: mill-lane-bakery', `id: ${id}`], ['name: Mill Lane Bakery', `name: Cache Site ${id}`]])).expect(201);
      const after = await list();
      expect(after.total).toBe(i + 1);
      expect(after.items.map((s) => s.id)).toContain(id);
    }
  });

  it('When the same list is asked twice with nothing changed, then both answers are the same', async () => {
    const first = await request(weir.app).get('/api/sites?limit=50').set(lead.auth).expect(200);
    const second = await request(weir.app).get('/api/sites?limit=50').set(lead.auth).expect(200);
    expect(second.text).toBe(first.text);
  });

  it('When a client sends back the ETag it got, then 304 while nothing changed, and the new list after a change', async () => {
    const first = await request(weir.app).get('/api/sites?limit=50').set(lead.auth).expect(200);
    const tag = first.headers.etag;
    expect(tag).toMatch(/^W\/".+"$/);
    expect(first.headers['cache-control']).toBe('private, no-cache');
    await request(weir.app).get('/api/sites?limit=50').set(lead.auth).set('If-None-Match', tag).expect(304);
    await push(weir, installer, (await siteText([['id: mill-lane-bakery', 'id: cache-etag'], ['name: Mill Lane Bakery', 'name: Etag Yard']]))).expect(201);
    const changed = await request(weir.app).get('/api/sites?limit=50').set(lead.auth).set('If-None-Match', tag).expect(200);
    expect(changed.headers.etag).not.toBe(tag);
    expect(changed.body.items.map((s: { id: string }) => s.id)).toContain('cache-etag');
  });

  it('When a review changes a status, then the list shows the new status', async () => {
    const before = (await list()).items.find((s) => s.id === 'cache-a')!;
    expect(before.status).toBe('pending');
    const site = await request(weir.app).get('/api/sites/cache-a').set(lead.auth).expect(200);
    await review(weir, lead, site.body.latest.id, 'return', 'Label the CT leads').expect(200);
    expect((await list()).items.find((s) => s.id === 'cache-a')!.status).toBe('returned');
  });

  it('When another connection to the file changes a site, then the next list shows the change', async () => {
    await list();
    const other = otherConnection();
    try {
      await other.run(`UPDATE sites SET name = 'Renamed Elsewhere' WHERE id = 'cache-b'`);
    } finally {
      await other.close();
    }
    expect((await list()).items.find((s) => s.id === 'cache-b')!.name).toBe('Renamed Elsewhere');
  });

  it('When different pages, filters and sorts are asked for, then each gets its own answer', async () => {
    const byName = await list('limit=50&sort=name');
    const byNameDesc = await list('limit=50&sort=-name');
    expect(byName.items.map((s) => s.id)).toEqual([...byNameDesc.items.map((s) => s.id)].reverse());
    expect((await list('limit=1&page=2')).items).toHaveLength(1);
    expect((await list('limit=1&page=2')).items[0].id).not.toBe((await list('limit=1&page=1')).items[0].id);
    expect((await list('state=returned')).items.map((s) => s.id)).toEqual(['cache-a']);
    expect((await list('q=renamed')).items.map((s) => s.id)).toEqual(['cache-b']);
  });

  it('When data_version is read across a commit, then it changes, and it stays while nothing is written', async () => {
    const db = weir.runtime.db;
    const v1 = await db.dataVersion();
    expect(await db.dataVersion()).toBe(v1);
    await db.write((t) => db.sql(t).run(`UPDATE sites SET warning_count = warning_count + 1 WHERE id = 'cache-a'`).then(() => undefined));
    expect(await db.dataVersion()).not.toBe(v1);
  });
});
