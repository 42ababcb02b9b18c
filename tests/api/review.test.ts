import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Review } from '../../server/revisions/review.model.ts';
import { account, oneMoreUnit, push, review, siteText, startWeir, undersizedCts, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;
let lead2: Account;
let auditor: Account;
let admin: Account;

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead, lead2, auditor, admin] = await Promise.all([
    account(weir, 'installer'),
    account(weir, 'lead'),
    account(weir, 'lead', 'lead2'),
    account(weir, 'auditor'),
    account(weir, 'admin'),
  ]);
});
afterAll(() => weir.close());

const api = () => request(weir.app);
let siteSeq = 0;
/** A fresh site per test, so each starts from a known state. */
async function newSite(replacements: [string | RegExp, string][] = []) {
  const id = `review-site-${++siteSeq}`;
  return { id, text: await siteText([['id: mill-lane-bakery', `id: ${id}`], ...replacements]) };
}

describe('approve', () => {
  it('When a lead approves another\'s clean pending revision, then it is approved and becomes the site\'s current revision', async () => {
    const site = await newSite();
    const pushed = await push(weir, installer, site.text).expect(201);
    const res = await review(weir, lead, pushed.body.revision.id, 'approve', 'Checked on the drawing').expect(200);
    expect(res.body.revision).toMatchObject({ id: pushed.body.revision.id, state: 'approved', decidedAt: expect.any(String) });
    expect(res.body.review).toMatchObject({ decision: 'approve', comment: 'Checked on the drawing', reviewer: { id: lead.id, email: lead.email } });
    const s = await api().get(`/api/sites/${site.id}`).set(auditor.auth).expect(200);
    expect(s.body.site).toMatchObject({ status: 'approved', approvedRevisionId: pushed.body.revision.id });
    expect(s.body.approved).toMatchObject({ id: pushed.body.revision.id, summary: expect.any(Object) });

    // The next push is based on it, and its diff names just the change.
    const next = await push(weir, installer, site.text.replace('{ id: roof-east, units: 6,', '{ id: roof-east, units: 7,')).expect(201);
    expect(next.body.revision.parentId).toBe(pushed.body.revision.id);
    expect(next.body.revision.diff).toEqual([{ path: 'generation[roof-east].units', kind: 'changed', before: 6, after: 7 }]);
    expect(next.body.revision.diffBase).toEqual({ id: pushed.body.revision.id, number: 1 });
    const listed = await api().get(`/api/sites/${site.id}/revisions`).set(auditor.auth).expect(200);
    expect(listed.body.items[1].reviews).toEqual([expect.objectContaining({ decision: 'approve', reviewer: expect.objectContaining({ id: lead.id }) })]);
  });

  it('When the author reviews their own revision, then 403 own-revision (four eyes), even as a lead', async () => {
    const site = await newSite();
    const pushed = await push(weir, lead, site.text).expect(201);
    expect((await review(weir, lead, pushed.body.revision.id, 'approve').expect(403)).body.error.code).toBe('own-revision');
    expect((await review(weir, lead, pushed.body.revision.id, 'return', 'mine').expect(403)).body.error.code).toBe('own-revision');
    await review(weir, lead2, pushed.body.revision.id, 'approve').expect(200);
  });

  it('When an installer, an auditor or an admin reviews, then 403 forbidden', async () => {
    const site = await newSite();
    const pushed = await push(weir, lead, site.text).expect(201);
    for (const who of [installer, auditor, admin]) {
      expect((await review(weir, who, pushed.body.revision.id, 'approve').expect(403)).body.error.code).toBe('forbidden');
    }
    await api().post(`/api/revisions/${pushed.body.revision.id}/review`).send({ decision: 'approve' }).expect(401);
  });

  it('When the revision has error findings, then approve is 409 has-errors, while return still works', async () => {
    const site = await newSite(undersizedCts());
    const pushed = await push(weir, installer, site.text).expect(201);
    const res = await review(weir, lead, pushed.body.revision.id, 'approve').expect(409);
    expect(res.body.error.code).toBe('has-errors');
    expect(res.body.error.details.map((f: { ruleId: string }) => f.ruleId)).toEqual(['ct-undersized', 'ct-undersized', 'ct-undersized']);
    await review(weir, lead, pushed.body.revision.id, 'return', 'The CTs are smaller than the main breaker.').expect(200);
  });

  it('When the revision is no longer pending (approved, returned or superseded), then 409 not-pending', async () => {
    const site = await newSite();
    const first = await push(weir, installer, site.text).expect(201);
    await push(weir, installer, site.text.replace('units: 6, unitAcKw: 0.4, phase: L2', 'units: 5, unitAcKw: 0.4, phase: L2')).expect(201);
    expect((await review(weir, lead, first.body.revision.id, 'approve').expect(409)).body.error.code).toBe('not-pending');

    const other = await newSite();
    const pushed = await push(weir, installer, other.text).expect(201);
    await review(weir, lead, pushed.body.revision.id, 'approve').expect(200);
    expect((await review(weir, lead2, pushed.body.revision.id, 'approve').expect(409)).body.error.code).toBe('not-pending');
    expect((await review(weir, lead2, pushed.body.revision.id, 'return', 'late').expect(409)).body.error.code).toBe('not-pending');
  });

  it('When the approved revision it was based on is no longer the site\'s, then 409 stale-parent', async () => {
    // Pushes supersede older pending revisions, so in normal use a pending revision's parent is
    // always the current approved one. The guard covers a change made outside this process: here
    // the site's approved revision is moved in SQLite directly, as a restore or another writer could.
    const site = await newSite();
    const base = await push(weir, installer, site.text).expect(201);
    await review(weir, lead, base.body.revision.id, 'approve').expect(200);
    const pending = await push(weir, installer, site.text.replace('{ id: roof-east, units: 6,', '{ id: roof-east, units: 7,')).expect(201);
    await weir.runtime.db.sequelize.query('UPDATE sites SET approved_revision_id = NULL WHERE id = ?', { replacements: [site.id] });
    const blockers = await api().get(`/api/revisions/${pending.body.revision.id}`).set(lead.auth).expect(200);
    expect(blockers.body.revision.approvalBlockers).toEqual(['stale-parent']);
    expect((await review(weir, lead, pending.body.revision.id, 'approve').expect(409)).body.error.code).toBe('stale-parent');
  });
});

describe('return', () => {
  it('When a lead returns without a comment, then 422 comment-required; with one, then returned', async () => {
    const site = await newSite();
    const pushed = await push(weir, installer, site.text).expect(201);
    expect((await review(weir, lead, pushed.body.revision.id, 'return').expect(422)).body.error.code).toBe('comment-required');
    expect((await review(weir, lead, pushed.body.revision.id, 'return', '   ').expect(422)).body.error.code).toBe('comment-required');
    const res = await review(weir, lead, pushed.body.revision.id, 'return', 'Add the commissioning readings.').expect(200);
    expect(res.body.revision.state).toBe('returned');
    const s = await api().get(`/api/sites/${site.id}`).set(installer.auth).expect(200);
    // Returned and never approved: the status says what is needed next (returned); the
    // `never-approved` filter still finds it.
    expect(s.body.site.status).toBe('returned');
    const filtered = await api().get('/api/sites').query({ state: 'returned' }).set(installer.auth).expect(200);
    expect(filtered.body.items.map((i: { id: string }) => i.id)).toContain(site.id);
  });

  it('When a site with an approved revision gets a newer one returned, then its status is returned', async () => {
    const site = await newSite();
    const base = await push(weir, installer, site.text).expect(201);
    await review(weir, lead, base.body.revision.id, 'approve').expect(200);
    const next = await push(weir, installer, (await siteText(oneMoreUnit())).replace('id: mill-lane-bakery', `id: ${site.id}`)).expect(201);
    await review(weir, lead2, next.body.revision.id, 'return', 'Which roof?').expect(200);
    const s = await api().get(`/api/sites/${site.id}`).set(installer.auth).expect(200);
    expect(s.body.site).toMatchObject({ status: 'returned', approvedRevisionId: base.body.revision.id });
  });
});

describe('bad review requests', () => {
  it('When the decision or body is bad, then 400; when the revision is unknown, then 404', async () => {
    const site = await newSite();
    const pushed = await push(weir, installer, site.text).expect(201);
    const id = pushed.body.revision.id;
    await api().post(`/api/revisions/${id}/review`).set(lead.auth).send({ decision: 'maybe' }).expect(400);
    await api().post(`/api/revisions/${id}/review`).set(lead.auth).send({}).expect(400);
    await api().post(`/api/revisions/${id}/review`).set(lead.auth).send({ decision: 'approve', comment: 5 }).expect(400);
    await api().post(`/api/revisions/${id}/review`).set(lead.auth).set('Content-Type', 'application/json').send('{bad').expect(400);
    await api().post(`/api/revisions/${id}/review`).set(lead.auth).set('Content-Type', 'text/plain').send('approve').expect(415);
    await review(weir, lead, 999999, 'approve').expect(404);
    await review(weir, lead, 'x' as unknown as number, 'approve').expect(404);
  });
});

describe('concurrent reviews', () => {
  it('When two leads review one revision at the same moment, then exactly one wins and the other gets 409 not-pending', async () => {
    const site = await newSite();
    const pushed = await push(weir, installer, site.text).expect(201);
    const id = pushed.body.revision.id;
    const results = await Promise.all([review(weir, lead, id, 'approve', 'first'), review(weir, lead2, id, 'return', 'second'), review(weir, lead, id, 'approve', 'third')]);
    const statuses = results.map((r) => r.status).sort();
    expect(statuses).toEqual([200, 409, 409]);
    for (const r of results.filter((x) => x.status === 409)) expect(r.body.error.code).toBe('not-pending');
    expect(await Review.count({ where: { revisionId: id } })).toBe(1);
    const decided = await api().get('/api/audit').query({ site: site.id, action: 'revision.*' }).set(auditor.auth).expect(200);
    expect(decided.body.items.filter((e: { action: string }) => e.action === 'revision.approved' || e.action === 'revision.returned')).toHaveLength(1);
  });
});
