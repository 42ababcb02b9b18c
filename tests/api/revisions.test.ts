import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Revision } from '../../server/revisions/revision.model.ts';
import { Site } from '../../server/sites/site.model.ts';
import { account, oneMoreUnit, push, siteText, startWeir, undersizedCts, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let installer: Account;
let lead: Account;
let auditor: Account;
let admin: Account;

beforeAll(async () => {
  weir = await startWeir();
  [installer, lead, auditor, admin] = await Promise.all([account(weir, 'installer'), account(weir, 'lead'), account(weir, 'auditor'), account(weir, 'admin')]);
});
afterAll(() => weir.close());

const api = () => request(weir.app);

describe('POST /api/revisions', () => {
  it('When an installer pushes a new site file, then 201, the site is created and the server ran the rules itself', async () => {
    const text = await siteText();
    const res = await push(weir, installer, text, 'First design').expect(201);
    expect(res.body.created).toBe(true);
    expect(res.body.revision).toMatchObject({
      siteId: 'mill-lane-bakery',
      number: 1,
      state: 'pending',
      message: 'First design',
      parentId: null,
      errorCount: 0,
      author: { id: installer.id, email: installer.email },
      yaml: text,
    });
    expect(res.body.revision.sha256).toMatch(/^[0-9a-f]{64}$/);
    // The fixture has no commissioning section: the engine reports it as an info.
    expect(res.body.revision.findings.map((f: { ruleId: string }) => f.ruleId)).toEqual(['commissioning-missing']);
    // 3 × 6 × 0.4 kW = 7.2 kVA of generation (rules.md, "Summary figures": G = Σ units·unitAcKw).
    expect(res.body.revision.summary.generationTotalKva).toBeCloseTo(7.2, 6);
    const site = await api().get('/api/sites/mill-lane-bakery').set(auditor.auth).expect(200);
    expect(site.body.site).toMatchObject({ id: 'mill-lane-bakery', name: 'Mill Lane Bakery', status: 'pending', approvedRevisionId: null });
  });

  it('When the same text is pushed again, then 200 with the existing revision and nothing new is stored', async () => {
    const before = await Revision.count();
    const res = await push(weir, lead, await siteText()).expect(200);
    expect(res.body.created).toBe(false);
    expect(res.body.revision).toMatchObject({ siteId: 'mill-lane-bakery', number: 1, author: { id: installer.id } });
    expect(await Revision.count()).toBe(before);
  });

  it('When a newer file of the same site is pushed, then the older pending revision is superseded', async () => {
    const res = await push(weir, lead, await siteText(oneMoreUnit())).set('X-Weir-Message', encodeURIComponent('One more inverter – east roof')).expect(201);
    expect(res.body.revision).toMatchObject({ number: 2, state: 'pending', message: 'One more inverter – east roof' });
    const list = await api().get('/api/sites/mill-lane-bakery/revisions').set(installer.auth).expect(200);
    expect(list.body.items.map((r: { number: number; state: string }) => [r.number, r.state])).toEqual([
      [2, 'pending'],
      [1, 'superseded'],
    ]);
    const log = await api().get('/api/audit').query({ site: 'mill-lane-bakery', action: 'revision.superseded' }).set(auditor.auth).expect(200);
    expect(log.body.items[0]).toMatchObject({ revisionId: list.body.items[1].id, details: { supersededBy: list.body.items[0].id } });
  });

  it('When the file has error findings, then it is stored all the same (201) with its counts', async () => {
    const res = await push(weir, installer, await siteText(undersizedCts())).expect(201);
    // ct-undersized fires once per CT: 50 A rated primary under an 80 A main breaker (rules.md "CTs", common practice).
    expect(res.body.revision.errorCount).toBe(3);
    expect(res.body.revision.findings.filter((f: { ruleId: string }) => f.ruleId === 'ct-undersized')).toHaveLength(3);
  });

  it('When the YAML does not parse or fails the schema, then 422 invalid-site with the findings, and nothing is stored', async () => {
    const before = { revisions: await Revision.count(), sites: await Site.count() };
    const broken = await push(weir, installer, 'weir: 1\nsite: [unclosed\n').expect(422);
    expect(broken.body.error.code).toBe('invalid-site');
    expect(broken.body.error.details[0]).toMatchObject({ ruleId: 'yaml-syntax', severity: 'error', line: expect.any(Number), column: expect.any(Number) });

    const schema = await push(weir, installer, (await siteText([['id: mill-lane-bakery', 'id: other-site']])).replace('arrangement: three-phase-4w', 'arrangement: four-phase')).expect(422);
    expect(schema.body.error.details.some((f: { ruleId: string; path: string }) => f.ruleId === 'schema' && f.path === 'service.arrangement')).toBe(true);

    await push(weir, installer, '').expect(422);
    expect({ revisions: await Revision.count(), sites: await Site.count() }).toEqual(before);
  });

  it('When the body is not YAML, too big, not UTF-8, or the message too long, then a clear 4xx', async () => {
    const text = await siteText();
    const json = await api().post('/api/revisions').set(installer.auth).send({ yaml: text }).expect(415);
    expect(json.body.error.code).toBe('unsupported-media-type');
    await api().post('/api/revisions').set(installer.auth).set('Content-Type', 'text/plain').send(text).expect(415);
    await api().post('/api/revisions').set(installer.auth).set('Content-Type', 'application/yaml; charset=latin1').send(text).expect(415);

    // 512 kB is the documented YAML body limit.
    const big = `${text}\n${'# padding\n'.repeat(60_000)}`;
    expect((await push(weir, installer, big).expect(413)).body.error.code).toBe('payload-too-large');

    const latin1 = Buffer.concat([Buffer.from(text.replace('Mill Lane Bakery', 'Mill Lane Bakery Caf')), Buffer.from([0xe9, 0x0a])]);
    const res = await api().post('/api/revisions').set(installer.auth).set('Content-Type', 'application/yaml').send(latin1).expect(400);
    expect(res.body.error.code).toBe('invalid-encoding');

    await push(weir, installer, text, 'x'.repeat(1001)).expect(400);
    await api().post('/api/revisions').query('message=a&message=b').set(installer.auth).set('Content-Type', 'application/yaml').send(text).expect(400);
  });

  it('When an auditor or an admin pushes, then 403; without a token, then 401', async () => {
    const text = await siteText(oneMoreUnit());
    for (const who of [auditor, admin]) expect((await push(weir, who, text).expect(403)).body.error.code).toBe('forbidden');
    await api().post('/api/revisions').set('Content-Type', 'application/yaml').send(text).expect(401);
  });

  it('When two pushes of the same new text race, then exactly one revision is created and both answer it', async () => {
    const text = await siteText([['id: mill-lane-bakery', 'id: race-site']]);
    const [a, b] = await Promise.all([push(weir, installer, text), push(weir, lead, text)]);
    expect([a.status, b.status].sort()).toEqual([200, 201]);
    expect(a.body.revision.id).toBe(b.body.revision.id);
    expect(await Revision.count({ where: { siteId: 'race-site' } })).toBe(1);
  });
});

describe('GET /api/revisions/:id', () => {
  it('When read, then it has the text, findings, figures, reviews, the diff against the approved revision and the caller\'s blockers', async () => {
    const site = await api().get('/api/sites/mill-lane-bakery').set(installer.auth).expect(200);
    const latest = site.body.latest;
    const res = await api().get(`/api/revisions/${latest.id}`).set(lead.auth).expect(200);
    const r = res.body.revision;
    expect(r).toMatchObject({ id: latest.id, reviews: [], diffBase: null });
    expect(r.yaml).toContain('mill-lane-bakery');
    expect(Array.isArray(r.findings)).toBe(true);
    expect(r.summary.liveConductors).toEqual(['L1', 'L2', 'L3']);
    // Nothing approved yet: the diff shows the whole file as added.
    expect(r.diff.every((c: { kind: string }) => c.kind === 'added')).toBe(true);
    // The latest is the 3-error push; the lead did not write it.
    expect(r.approvalBlockers).toEqual(['has-errors']);
    const asInstaller = await api().get(`/api/revisions/${latest.id}`).set(installer.auth).expect(200);
    expect(asInstaller.body.revision.approvalBlockers).toEqual(['not-a-lead', 'own-revision', 'has-errors']);
  });

  it('When the id names nothing, then 404', async () => {
    for (const id of ['999999', 'abc', '0', '-1', '1.5']) expect((await api().get(`/api/revisions/${id}`).set(auditor.auth).expect(404)).body.error.code).toBe('not-found');
  });
});

describe('GET /api/sites', () => {
  beforeAll(async () => {
    // Three more sites: names to search and sort on, one with errors.
    await push(weir, installer, await siteText([['id: mill-lane-bakery', 'id: alder-court'], ['name: Mill Lane Bakery', 'name: Alder Court 100%']])).expect(201);
    await push(weir, installer, await siteText([['id: mill-lane-bakery', 'id: zephyr-hall'], ['name: Mill Lane Bakery', 'name: Zephyr Hall']])).expect(201);
  });

  it('When listed, then { items, total, page, limit }, newest change first by default', async () => {
    const res = await api().get('/api/sites').set(auditor.auth).expect(200);
    expect(res.body).toMatchObject({ total: 4, page: 1, limit: 20 });
    expect(res.body.items[0].id).toBe('zephyr-hall');
    expect(res.body.items[0]).toMatchObject({ status: 'pending', approvedRevisionId: null, latestRevision: { number: 1, state: 'pending' }, updatedBy: { email: installer.email } });
    expect(res.body.items[0].latestRevision).not.toHaveProperty('yaml');
  });

  it('When sorted, searched, filtered and paged, then the list follows', async () => {
    const names = (r: request.Response) => r.body.items.map((s: { id: string }) => s.id);
    expect(names(await api().get('/api/sites').query({ sort: 'name' }).set(admin.auth).expect(200))).toEqual(['alder-court', 'mill-lane-bakery', 'race-site', 'zephyr-hall']);
    expect(names(await api().get('/api/sites').query({ sort: '-errors' }).set(admin.auth).expect(200))[0]).toBe('mill-lane-bakery');
    expect(names(await api().get('/api/sites').query({ q: 'ZEPHYR' }).set(admin.auth).expect(200))).toEqual(['zephyr-hall']);
    // A % in the search is a character, not a wildcard.
    expect(names(await api().get('/api/sites').query({ q: '100%' }).set(admin.auth).expect(200))).toEqual(['alder-court']);
    expect(names(await api().get('/api/sites').query({ q: '%' }).set(admin.auth).expect(200))).toEqual(['alder-court']);
    expect((await api().get('/api/sites').query({ state: 'approved' }).set(admin.auth).expect(200)).body.total).toBe(0);
    expect((await api().get('/api/sites').query({ state: 'never-approved' }).set(admin.auth).expect(200)).body.total).toBe(4);
    const page2 = await api().get('/api/sites').query({ sort: 'name', limit: 3, page: 2 }).set(admin.auth).expect(200);
    expect(page2.body).toMatchObject({ total: 4, page: 2, limit: 3 });
    expect(names(page2)).toEqual(['zephyr-hall']);
  });

  it('When the query is invalid, then 400 invalid-query', async () => {
    for (const query of [{ page: 0 }, { page: 'x' }, { limit: 1000 }, { sort: 'size' }, { state: 'lost' }, 'page=1&page=2']) {
      const res = await api().get('/api/sites').query(query).set(auditor.auth).expect(400);
      expect(res.body.error.code).toBe('invalid-query');
    }
  });

  it('When no token is given, then 401', async () => {
    await api().get('/api/sites').expect(401);
    await api().get('/api/sites/mill-lane-bakery').expect(401);
  });
});

describe('GET /api/sites/:id and its revisions', () => {
  it('When the site is unknown or the id is not a site id, then 404', async () => {
    await api().get('/api/sites/no-such-site').set(auditor.auth).expect(404);
    await api().get('/api/sites/NOT%20VALID').set(auditor.auth).expect(404);
    await api().get('/api/sites/no-such-site/revisions').set(auditor.auth).expect(404);
  });

  it('When read, then { site, approved, latest } with the summary figures', async () => {
    const res = await api().get('/api/sites/alder-court').set(installer.auth).expect(200);
    expect(res.body.approved).toBeNull();
    expect(res.body.latest).toMatchObject({ number: 1, state: 'pending' });
    expect(res.body.latest.summary.generationTotalKva).toBeCloseTo(7.2, 6);
    expect(res.body.site.name).toBe('Alder Court 100%');
  });
});
