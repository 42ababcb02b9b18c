// Group commit (server/db.ts): writes that queue up while a transaction runs share the next one,
// each in a savepoint. What must hold is what a plain transaction per write gave: each write
// counts whole or not at all, a failing write takes nobody else down, and nobody hears of
// success before the COMMIT.
import type { Transaction } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { push, siteText, startWeir, account, type TestWeir } from './helpers.ts';

let weir: TestWeir;

beforeAll(async () => {
  weir = await startWeir();
  const sql = weir.runtime.db.sql();
  await sql.run('CREATE TABLE gc_parent (id INTEGER PRIMARY KEY)');
  // A deferred foreign key is checked at COMMIT: the way to make a COMMIT fail on purpose.
  await sql.run('CREATE TABLE gc_row (id INTEGER PRIMARY KEY, tag TEXT NOT NULL, parent INTEGER REFERENCES gc_parent (id) DEFERRABLE INITIALLY DEFERRED)');
});
afterAll(() => weir.close());

const db = () => weir.runtime.db;

/**
 * A write that holds the transaction until released, so that the next writes queue behind it
 * and share the one after: `release(n)` waits until n writes are queued, then lets go.
 */
function blocker() {
  let open!: () => void;
  const gate = new Promise<void>((resolve) => (open = resolve));
  const done = db().write(async (t) => {
    await db().sql(t).run("INSERT INTO gc_row (tag) VALUES ('blocker')");
    await gate;
  });
  const release = async (n: number) => {
    try {
      for (let i = 0; i < 400 && db().queuedWrites() < n; i++) await new Promise((r) => setTimeout(r, 5));
      expect(db().queuedWrites()).toBe(n);
    } finally {
      // Never leave the writer held, even when the expectation fails.
      open();
      await done;
    }
  };
  return { release };
}

const insert = (tag: string, extra?: (t: Transaction) => Promise<void>) =>
  db().write(async (t) => {
    await db().sql(t).run('INSERT INTO gc_row (tag) VALUES (?)', [tag]);
    await extra?.(t);
    return tag;
  });

const tags = async (prefix: string) => (await db().sql().all<{ tag: string }>('SELECT tag FROM gc_row WHERE tag LIKE ? ORDER BY id', [`${prefix}%`])).map((r) => r.tag);

describe('group commit', () => {
  it('When one write of a group fails, then only its own changes are undone and the others are stored', async () => {
    const b = blocker();
    const writes = [
      insert('a-1'),
      insert('a-2'),
      insert('a-3', async () => {
        throw new Error('the third write fails after its insert');
      }),
      insert('a-4'),
    ];
    const settled = Promise.allSettled(writes);
    await b.release(4);
    const outcomes = await settled;
    expect(outcomes.map((o) => o.status)).toEqual(['fulfilled', 'fulfilled', 'rejected', 'fulfilled']);
    expect((outcomes[2] as PromiseRejectedResult).reason.message).toBe('the third write fails after its insert');
    expect(await tags('a-')).toEqual(['a-1', 'a-2', 'a-4']);
  });

  it('When the COMMIT of a group fails, then every write of the group fails and none is stored', async () => {
    const b = blocker();
    const writes = [
      insert('b-1'),
      // Passes its own statements; the COMMIT finds the parent missing.
      insert('b-2', async (t) => {
        await db().sql(t).run("INSERT INTO gc_row (tag, parent) VALUES ('b-orphan', 999)");
      }),
      insert('b-3'),
    ];
    const settled = Promise.allSettled(writes);
    await b.release(3);
    const outcomes = await settled;
    expect(outcomes.map((o) => o.status)).toEqual(['rejected', 'rejected', 'rejected']);
    for (const o of outcomes) expect(String((o as PromiseRejectedResult).reason)).toMatch(/FOREIGN KEY constraint failed/);
    expect(await tags('b-')).toEqual([]);
    // The writer is usable afterwards.
    expect(await insert('b-after')).toBe('b-after');
    expect(await tags('b-')).toEqual(['b-after']);
  });

  it('When a write of a group resolves, then its changes are already visible to a reader on another connection', async () => {
    const b = blocker();
    const seen: string[][] = [];
    const writes = ['c-1', 'c-2', 'c-3'].map((tag) =>
      insert(tag).then(async () => {
        seen.push(await tags('c-'));
      }),
    );
    await b.release(3);
    await Promise.all(writes);
    // Each write's own row is there when its caller hears of it: the group committed first.
    expect(seen.every((s) => s.length === 3)).toBe(true);
  });

  it('When writes through the models share a group and one is refused, then the others and their change-log events are stored', async () => {
    const { createServices } = await import('../../server/services.ts');
    const users = createServices(weir.runtime).users;
    const b = blocker();
    const emails = ['g1@example.test', 'g2@example.test', 'g1@example.test', 'g3@example.test'];
    const settled = Promise.allSettled(emails.map((email, i) => users.create({ email, name: `Group ${i + 1}`, role: 'installer', password: 'a-long-password' }, null)));
    // Each hashes its password before it queues its write.
    await b.release(4);
    const outcomes = await settled;
    // The hashes finish in any order, so either of the two for g1 may be the one refused.
    const refused = outcomes.flatMap((o, i) => (o.status === 'rejected' ? [i] : []));
    expect(refused).toHaveLength(1);
    expect([0, 2]).toContain(refused[0]);
    expect((outcomes[refused[0]] as PromiseRejectedResult).reason.code).toBe('email-taken');
    const rows = await db().sql().all<{ email: string }>(`SELECT email FROM users WHERE email LIKE 'g_@example.test' ORDER BY email`);
    expect(rows.map((r) => r.email)).toEqual(['g1@example.test', 'g2@example.test', 'g3@example.test']);
    const events = await db().sql().all<{ details: string }>(`SELECT details FROM audit_events WHERE action = 'user.created' AND details LIKE '%"g_@example.test"%'`);
    expect(events.map((e) => JSON.parse(e.details).email).sort()).toEqual(['g1@example.test', 'g2@example.test', 'g3@example.test']);
    expect((await createServices(weir.runtime).audit.verify()).ok).toBe(true);
  });

  it('When a pipelined write has issued a statement that fails, then every write of its group fails and none is stored', async () => {
    const b = blocker();
    const pipelined = (tag: string | null) =>
      db().writePipelined(async (t) => {
        const sql = db().sql(t);
        return { value: tag, issued: Promise.all([sql.run('INSERT INTO gc_row (tag) VALUES (?)', [tag]), sql.run("INSERT INTO gc_row (tag) VALUES ('d-after')")]) };
      });
    // The second breaks NOT NULL after it has returned; the third started meanwhile.
    const settled = Promise.allSettled([insert('d-1'), pipelined(null), pipelined('d-3')]);
    await b.release(3);
    const outcomes = await settled;
    expect(outcomes.map((o) => o.status)).toEqual(['rejected', 'rejected', 'rejected']);
    for (const o of outcomes) expect(String((o as PromiseRejectedResult).reason)).toMatch(/NOT NULL constraint failed/);
    expect(await tags('d-')).toEqual([]);
  });

  it('When one batch holds two pushes of one site and the same text twice, then they come out as pushes one after the other would', async () => {
    const { storeBatch } = await import('../../server/revisions/push-batch.ts');
    const { createServices } = await import('../../server/services.ts');
    const { User } = await import('../../server/users/user.model.ts');
    const { checkSite } = await import('../../shared/index.ts');
    const { sha256Hex } = await import('../../server/lib/hash.ts');
    const who = await account(weir, 'installer', 'batcher');
    const author = (await User.findByPk(who.id))!;
    const first = (await siteText()).replace('id: mill-lane-bakery', 'id: one-batch-site');
    const second = first.replace('name: Mill Lane Bakery', 'name: Mill Lane Bakery Annex');
    const input = (text: string) => {
      const check = checkSite(text);
      return { text, message: null, author, doc: check.site!, check, sha256: sha256Hex(text) };
    };
    const audit = createServices(weir.runtime).audit;
    const stored = await db().writePipelined((t) => storeBatch(db(), audit, t, new Date(), [input(first), input(second), input(second)]));
    expect(stored.map((s) => s.created)).toEqual([true, true, false]);
    expect(stored[2].id).toBe(stored[1].id);
    const rows = await db().sql().all<{ id: number; number: number; state: string }>(`SELECT id, number, state FROM revisions WHERE site_id = 'one-batch-site' ORDER BY number`);
    expect(rows).toEqual([
      { id: stored[0].id, number: 1, state: 'superseded' },
      { id: stored[1].id, number: 2, state: 'pending' },
    ]);
    const site = await db().sql().get<{ name: string; latest: number; status: string }>(`SELECT name, latest_revision_id AS latest, status FROM sites WHERE id = 'one-batch-site'`);
    expect(site).toEqual({ name: 'Mill Lane Bakery Annex', latest: stored[1].id, status: 'pending' });
    const events = await db().sql().all<{ action: string; revisionId: number | null }>(`SELECT action, revision_id AS revisionId FROM audit_events WHERE site_id = 'one-batch-site' ORDER BY seq`);
    expect(events).toEqual([
      { action: 'site.created', revisionId: null },
      { action: 'revision.pushed', revisionId: stored[0].id },
      { action: 'revision.pushed', revisionId: stored[1].id },
      { action: 'revision.superseded', revisionId: stored[0].id },
    ]);
    expect((await audit.verify()).ok).toBe(true);
  });

  it('When pushes of one site arrive at once, then their numbers run 1, 2, 3 and only the last is pending', async () => {
    const who = await account(weir, 'installer', 'racer');
    const base = (await siteText()).replace('id: mill-lane-bakery', 'id: racing-site');
    const texts = [1, 2, 3].map((i) => base.replace('name: Mill Lane Bakery', `name: Mill Lane Bakery ${i}`));
    const answers = await Promise.all(texts.map((t) => push(weir, who, t)));
    expect(answers.map((a) => a.status)).toEqual([201, 201, 201]);
    const rows = await db().sql().all<{ number: number; state: string }>(`SELECT number, state FROM revisions WHERE site_id = 'racing-site' ORDER BY number`);
    expect(rows).toEqual([
      { number: 1, state: 'superseded' },
      { number: 2, state: 'superseded' },
      { number: 3, state: 'pending' },
    ]);
  });

  it('When many pushes arrive at once, then each is stored with its own revision, site and change-log events, and the chain verifies', async () => {
    const installer = await account(weir, 'installer');
    const base = await siteText();
    const ids = Array.from({ length: 12 }, (_, i) => `group-site-${i + 1}`);
    const answers = await Promise.all(ids.map((id) => push(weir, installer, base.replace('id: mill-lane-bakery', `id: ${id}`))));
    expect(answers.map((a) => a.status)).toEqual(ids.map(() => 201));
    expect(new Set(answers.map((a) => a.body.revision.id)).size).toBe(ids.length);
    const rows = await db().sql().all<{ id: string; latest: number }>(`SELECT id, latest_revision_id AS latest FROM sites WHERE id LIKE 'group-site-%'`);
    expect(rows).toHaveLength(ids.length);
    for (const a of answers) expect(rows.find((r) => r.id === a.body.revision.siteId)?.latest).toBe(a.body.revision.id);
    const events = await db().sql().all<{ action: string }>(`SELECT action FROM audit_events WHERE site_id LIKE 'group-site-%'`);
    expect(events.filter((e) => e.action === 'site.created')).toHaveLength(ids.length);
    expect(events.filter((e) => e.action === 'revision.pushed')).toHaveLength(ids.length);
    const { createServices } = await import('../../server/services.ts');
    expect((await createServices(weir.runtime).audit.verify()).ok).toBe(true);
  });
});
