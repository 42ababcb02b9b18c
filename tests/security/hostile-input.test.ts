// Hostile input, property-based (fast-check), against the routes that take a body from the
// outside: POST /api/revisions, the review route, sign-in and uploads. The promise: a 4xx in the
// error shape with a clear message, never a 5xx, the app keeps answering, and nothing is stored
// (rows per table and files in the upload store, counted before and after; failed sign-ins are
// logged on purpose and left out of the count).
import fc from 'fast-check';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import type { Role } from '../../server/auth/permissions.ts';
import { accountsByRole, account, push, siteText, startWeir, state, type Account, type TestWeir } from './support/in-process.ts';
import { ABSURD, arbitraries, deepJson, deepNesting, fieldLabel, FIXTURE, HTML_NAMES, ID_FRAGMENTS, NUMERIC_FIELDS, withNumber } from './support/hostile.ts';

// Enough runs to meet each kind of input several times; the whole folder stays well under two
// minutes on two cores. WEIR_FUZZ_RUNS raises them for a longer hunt.
const scale = Math.max(1, Number(process.env.WEIR_FUZZ_RUNS ?? 40) / 40);
const RUNS = { numRuns: Math.round(40 * scale) };
const FEW = { numRuns: Math.round(12 * scale) };

let weir: TestWeir;
let accounts: Record<Role, Account>;
let otherLead: Account;
let pendingId: number;
let before: Record<string, number>;
const api = () => request(weir.app);

beforeAll(async () => {
  weir = await startWeir();
  accounts = await accountsByRole(weir);
  otherLead = await account(weir, 'lead', 'lead-two');
  // A pending revision pushed by the installer: the target of the review attacks.
  pendingId = (await push(weir, accounts.installer, await siteText()).expect(201)).body.revision.id;
  before = await state(weir);
});
afterAll(() => weir?.close());

afterEach(async () => {
  // Whatever a test threw at it, the app still answers and holds exactly what it held.
  await api().get('/api/health').expect(200);
  const now = await state(weir);
  const expected = before;
  // Reset first, so that one test's leak is reported once, not by every test after it.
  before = now;
  expect(now).toEqual(expected);
  expect(({} as Record<string, unknown>).polluted, 'Object.prototype was polluted').toBeUndefined();
});

/** A refusal: a 4xx, JSON in the error shape, a message in words, nothing of the server's inside. */
function expectRefused(res: request.Response, statuses?: number[]) {
  expect(res.status, res.text.slice(0, 300)).toBeGreaterThanOrEqual(400);
  expect(res.status, res.text.slice(0, 300)).toBeLessThan(500);
  if (statuses) expect(statuses, res.text.slice(0, 300)).toContain(res.status);
  expect(res.headers['content-type']).toMatch(/^application\/json/);
  expect(res.body.error.code).toMatch(/^[a-z-]+$/);
  expect(typeof res.body.error.message).toBe('string');
  expect(res.body.error.message.length).toBeGreaterThan(5);
  expect(res.text).not.toMatch(/\n\s+at |node_modules|SQLITE_|Sequelize|\/work\//);
}

const pushRaw = (body: Buffer | string, type = 'application/yaml') => api().post('/api/revisions').set(accounts.installer.auth).set('Content-Type', type).send(body);

describe('POST /api/revisions', () => {
  it('When the body is random bytes, then 400 invalid-encoding or 422 invalid-site', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.randomBytes, async (bytes) => expectRefused(await pushRaw(bytes), [400, 422])), RUNS);
  });

  it('When the site file holds invalid UTF-8 anywhere, then 400 invalid-encoding', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.invalidUtf8, async (bytes) => {
      const res = await pushRaw(bytes);
      expectRefused(res, [400]);
      expect(res.body.error.code).toBe('invalid-encoding');
    }), RUNS);
  });

  it('When the file is a YAML alias bomb, then 422 within a second and a finding that says so', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.aliasBomb, async (text) => {
      const t0 = performance.now();
      const res = await pushRaw(text);
      expect(performance.now() - t0).toBeLessThan(1000);
      expectRefused(res, [422]);
      expect(JSON.stringify(res.body.error.details)).toMatch(/alias|resource exhaustion/i);
    }), FEW);
  });

  it('When the file is nested 20,000 deep (flow or block), then 422, not a stack overflow', async () => {
    for (const form of ['flow-seq', 'flow-map', 'block-seq'] as const) {
      const res = await pushRaw(deepNesting(20_000, form));
      expectRefused(res, [422]);
    }
  });

  it('When the body is several megabytes, then 413 payload-too-large; a huge name within the limit is 422', async () => {
    await fc.assert(fc.asyncProperty(fc.integer({ min: 600 * 1024, max: 4 * 1024 * 1024 }), fc.constantFrom('x', 'é', '\u{1F600}'), async (size, ch) => {
      const res = await pushRaw(FIXTURE.replace('name: Mill Lane Bakery', `name: ${ch.repeat(Math.ceil(size / Buffer.byteLength(ch)))}`));
      expectRefused(res, [413]);
    }), { numRuns: 4 });
    expectRefused(await pushRaw(FIXTURE.replace('name: Mill Lane Bakery', `name: ${'x'.repeat(400 * 1024)}`)), [422]);
  });

  it('When a key appears twice in a mapping, then 422 with a duplicate-key finding', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.duplicateKey, async (text) => {
      const res = await pushRaw(text);
      expectRefused(res, [422]);
      expect(JSON.stringify(res.body.error.details)).toMatch(/duplicate key/);
    }), RUNS);
  });

  it('When __proto__, constructor or prototype is a key, then 422 and no object anywhere is polluted', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.prototypeKey, async (text) => expectRefused(await pushRaw(text), [422])), RUNS);
  });

  it('When a number is NaN or infinite (.nan, .inf, 1e999), then 422 naming the field', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.nonFinite, async (text) => {
      const res = await pushRaw(text);
      expectRefused(res, [422]);
      expect(res.body.error.details.some((f: { ruleId: string }) => f.ruleId === 'schema' || f.ruleId === 'yaml-syntax')).toBe(true);
    }), RUNS);
  });

  it('When the site id is made of path or SQL fragments, then 422 (the id pattern) and no table is touched', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.hostileSiteId, async (text) => expectRefused(await pushRaw(text), [422])), RUNS);
  });

  it('When the content type, charset or message is wrong, then 415 or 400', async () => {
    // JSON is parsed before the route is reached: a YAML body sent as JSON is 400 invalid-json.
    expectRefused(await pushRaw(FIXTURE, 'application/json'), [400, 415]);
    for (const type of ['text/plain', 'multipart/form-data; boundary=x', 'application/yaml; charset=utf-16', 'application/yaml; charset=latin1']) {
      expectRefused(await pushRaw(FIXTURE, type), [415]);
    }
    expectRefused(await api().post('/api/revisions').set(accounts.installer.auth).set('Content-Type', 'application/yaml').query({ message: 'm'.repeat(1001) }).send(FIXTURE), [400]);
    expectRefused(await api().post('/api/revisions').set(accounts.installer.auth).set('Content-Type', 'application/yaml').query('message=a&message=b').send(FIXTURE), [400]);
    expectRefused(await api().post('/api/revisions').set(accounts.installer.auth).set('Content-Type', 'application/yaml').set('Content-Encoding', 'gzip').send(Buffer.from('not gzip')), [400, 415]);
  });
});

describe('negative and absurd values', () => {
  type Outcome = 'refused' | 'stored, cannot be approved' | 'stored, approvable';

  /** Pushes the fixture with each field set to each value: what became of it, per field label. */
  async function outcomes(values: (field: (typeof NUMERIC_FIELDS)[number]) => string[]): Promise<Record<string, Outcome[]>> {
    const out: Record<string, Outcome[]> = {};
    let stored = false;
    try {
      for (const field of NUMERIC_FIELDS) {
        for (const value of values(field)) {
          // A site of its own, so the pending revision of the review tests stays pending.
          const text = withNumber(field, value).replace('id: mill-lane-bakery', 'id: absurd-values');
          const res = await pushRaw(text);
          expect(res.status, res.text.slice(0, 300)).toBeLessThan(500);
          let outcome: Outcome = 'refused';
          if (res.status >= 400) {
            expectRefused(res, [422]);
          } else {
            stored = true;
            const { revision } = res.body;
            await api().get(`/api/revisions/${revision.id}`).set(accounts.auditor.auth).expect(200);
            const approve = await api().post(`/api/revisions/${revision.id}/review`).set(accounts.lead.auth).send({ decision: 'approve' });
            outcome = revision.errorCount > 0 && approve.status === 409 ? 'stored, cannot be approved' : 'stored, approvable';
          }
          (out[`${fieldLabel(field)} = ${value}`] ??= []).push(outcome);
        }
      }
    } finally {
      // Stored variants are checked above; the count after each test then starts from here.
      if (stored) before = await state(weir);
    }
    return out;
  }

  const notRefused = (all: Record<string, Outcome[]>) => Object.fromEntries(Object.entries(all).filter(([, o]) => o.some((x) => x !== 'refused')));

  it('When a quantity is absurdly large (1e300, 2^53 + 1), then 422 from the schema\'s maxima, and nothing is stored', async () => {
    expect(notRefused(await outcomes(() => ABSURD))).toEqual({});
  });

  it('When a positive quantity is made negative, then 422 and nothing is stored (the Modbus address: an error that blocks approval)', async () => {
    // The schema leaves the Modbus address's range to the modbus-address rule (1–247, Modbus
    // over Serial Line V1.02 §2.2), which makes it an error finding.
    const left = notRefused(await outcomes(([, , n]) => (Number(n) > 0 ? ['-1', '-1e300'] : [])));
    for (const [field, outcome] of Object.entries(left)) {
      expect(field).toMatch(/^meter\.modbus\.address = /);
      expect(outcome.every((o) => o === 'stored, cannot be approved'), field).toBe(true);
    }
  });
});

describe('POST /api/revisions/:id/review', () => {
  const reviewRaw = (id: string | number, body: unknown, type = 'application/json') =>
    api().post(`/api/revisions/${id}/review`).set(accounts.lead.auth).set('Content-Type', type).send(typeof body === 'string' || Buffer.isBuffer(body) ? body : JSON.stringify(body));

  it('When the body is any JSON that is not a decision, then 400 and the revision stays pending', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.notAReview, async (body) => expectRefused(await reviewRaw(pendingId, body), [400])), RUNS);
    expect((await api().get(`/api/revisions/${pendingId}`).set(accounts.lead.auth)).body.revision.state).toBe('pending');
  });

  it('When the body has __proto__ or constructor keys, NaN, deep nesting, invalid UTF-8 or is huge, then 400 or 413', async () => {
    const bodies: [string | Buffer, number[]][] = [
      ['{"decision":"approve","__proto__":{"role":"admin"}}', [400]],
      ['{"__proto__":{"decision":"approve"}}', [400]],
      ['{"decision":"approve","constructor":{"prototype":{"polluted":true}}}', [400]],
      ['{"decision":NaN}', [400]],
      ['{"decision":"approve","comment":Infinity}', [400]],
      ['{"decision":"approve","decision":"return"}', [400, 422]],
      [deepJson(20_000), [400]],
      [Buffer.concat([Buffer.from('{"decision":"return","comment":"'), Buffer.from([0xc0, 0x80, 0xff]), Buffer.from('"}')]), [400, 422]],
      [JSON.stringify({ decision: 'return', comment: 'x'.repeat(200 * 1024) }), [413]],
      [JSON.stringify({ decision: 'return', comment: 'x'.repeat(4001) }), [400]],
      ['', [400]],
      ['null', [400]],
      ['[]', [400]],
    ];
    for (const [body, statuses] of bodies) expectRefused(await reviewRaw(pendingId, body), statuses);
    expectRefused(await reviewRaw(pendingId, 'decision=approve', 'application/x-www-form-urlencoded'), [415]);
    expectRefused(await reviewRaw(pendingId, '<decision>approve</decision>', 'application/xml'), [415]);
    expect((await api().get(`/api/revisions/${pendingId}`).set(accounts.lead.auth)).body.revision.state).toBe('pending');
  });

  it('When the revision id is a path or SQL fragment, a negative, a fraction or absurd, then 404 (or 400), never 5xx', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.hostileSegment, async (segment) => {
      const res = await reviewRaw(encodeURIComponent(segment), { decision: 'approve' });
      expectRefused(res, [400, 404]);
    }), RUNS);
  });
});

describe('POST /api/auth/login', () => {
  const loginRaw = (body: unknown, type = 'application/json') => api().post('/api/auth/login').set('Content-Type', type).send(typeof body === 'string' || Buffer.isBuffer(body) ? body : JSON.stringify(body));

  it('When the body is any JSON but an e-mail and a password, then 400', async () => {
    const notCredentials = fc.jsonValue({ maxDepth: 3 }).filter((v) => !(v && typeof v === 'object' && !Array.isArray(v) && typeof (v as { email?: unknown }).email === 'string' && typeof (v as { password?: unknown }).password === 'string'));
    await fc.assert(fc.asyncProperty(notCredentials, async (body) => expectRefused(await loginRaw(body), [400])), RUNS);
  });

  it('When e-mail and password are strings of any kind (SQL, markup, control characters, 200 emoji), then the same 401', async () => {
    const text = fc.oneof(fc.string({ minLength: 1, maxLength: 60 }), fc.constantFrom(...ID_FRAGMENTS, ...HTML_NAMES, "admin@example.test' --", 'admin@example.test\u0000', '\u{1F600}'.repeat(200), 'A'.repeat(200)));
    await fc.assert(fc.asyncProperty(text, text, async (email, password) => {
      const res = await loginRaw({ email, password });
      expectRefused(res, [400, 401]);
      if (res.status === 401) expect(res.body.error.code).toBe('invalid-credentials');
    }), FEW);
  });

  it('When the body is deep, huge, duplicated, prototype-laden or not JSON at all, then 400, 413 or 415', async () => {
    const bodies: [string | Buffer, number[], string?][] = [
      [`{"email":${'['.repeat(20_000)}${']'.repeat(20_000)},"password":"x"}`, [400]],
      [JSON.stringify({ email: 'a@example.test', password: 'x'.repeat(300 * 1024) }), [413]],
      ['{"email":"lead@example.test","password":"x","__proto__":{"admin":true}}', [400]],
      ['{"email":"lead@example.test","email":"admin@example.test","password":"x"}', [401]],
      ['{"email":"lead@example.test","password":', [400]],
      [Buffer.from([0xff, 0xfe, 0x00, 0x7b]), [400]],
      ['email=lead@example.test&password=x', [415], 'application/x-www-form-urlencoded'],
      ['{"email":"lead@example.test","password":"x"}', [415], 'text/plain'],
    ];
    for (const [body, statuses, type] of bodies) expectRefused(await loginRaw(body, type), statuses);
  });
});

describe('NUL characters and infinite numbers', () => {
  // SQLite reads a NUL in the SQL text as the end of the statement: a NUL that reached a WHERE
  // clause was a 500 (SQLITE_ERROR "unrecognized token") before server/lib/validate.ts refused it.
  it('When a sign-in, a search or a change-log filter holds a NUL, or a page number is infinite, then 400 naming the field', async () => {
    for (const [email, password] of [['\u0000', ' '], ['lead@example.test\u0000', 'x'], ['a@example.test', 'pass\u0000word']]) {
      const res = await api().post('/api/auth/login').send({ email, password });
      expectRefused(res, [400, 401]);
    }
    const nul = await api().post('/api/auth/login').send({ email: '\u0000', password: 'x' });
    expect(nul.body.error.details).toEqual([{ path: 'email', message: 'must not contain a NUL character' }]);
    for (const url of ['/api/sites?q=%00', '/api/sites?q=mill%00', '/api/audit?actor=a%00b', '/api/audit?site=mill%00', '/api/audit?action=revision%00.*', '/api/audit.csv?actor=%00', '/api/audit.csv?site=%00']) {
      const res = await api().get(url).set(accounts.lead.auth);
      expectRefused(res, [400]);
      expect(res.body.error.code, url).toBe('invalid-query');
    }
    // ajv coerces "Infinity" and "1e400" to a number and then skips minimum and maximum.
    for (const url of ['/api/sites?page=Infinity', '/api/sites?limit=1e400', '/api/audit?page=-Infinity', '/api/audit?limit=Infinity']) {
      const res = await api().get(url).set(accounts.lead.auth);
      expectRefused(res, [400]);
      expect(res.body.error.details[0].message, url).toMatch(/finite|must be/);
    }
    const admin = await api().post('/api/users').set(accounts.admin.auth).send({ email: 'nul\u0000@example.test', name: 'N', role: 'lead', password: 'long-enough-1' });
    expectRefused(admin, [400]);
  });
});

describe('POST /api/sites/:id/attachments', () => {
  const upload = (site: string, file: Buffer, filename: string, contentType: string, caption?: string) => {
    const req = api().post(`/api/sites/${site}/attachments`).set(accounts.installer.auth);
    if (caption !== undefined) req.field('caption', caption);
    return req.attach('file', file, { filename, contentType });
  };
  const hostileName = fc.oneof(fc.string({ minLength: 1, maxLength: 40 }), fc.constantFrom(...ID_FRAGMENTS.map((f) => `${f}.png`), 'photo.png\u0000.html', 'a\r\nContent-Type: text/html.png'));

  it('When the bytes are of no allowed type, whatever the declared type and name, then 415 and no file is kept', async () => {
    // Random bytes never start with the PNG, JPEG or PDF signature by chance (8, 3 and 5 fixed bytes).
    await fc.assert(fc.asyncProperty(arbitraries.randomBytes, fc.constantFrom('image/png', 'image/jpeg', 'application/pdf', 'text/html', 'application/octet-stream'), hostileName, async (bytes, type, name) => {
      const res = await upload('mill-lane-bakery', bytes, name.replace(/[\r\n"]/g, '_') || 'x', type);
      // A name with a NUL or other control byte can already break the part header, and a name
      // that is only a path ("\\", "../") is read as no file at all: both are 400.
      expectRefused(res, [400, 415]);
      expect(res.body.error.code).toMatch(/^(unsupported-file-type|invalid-upload|file-required)$/);
    }), RUNS);
  });

  it('When the site in the path is a path or SQL fragment, then 404 before the file is read', async () => {
    await fc.assert(fc.asyncProperty(arbitraries.hostileSegment, async (segment) => {
      expectRefused(await upload(encodeURIComponent(segment), Buffer.from('%PDF-1.4\n%%EOF\n'), 'a.pdf', 'application/pdf'), [400, 404]);
    }), RUNS);
  });

  it('When the multipart body is malformed, truncated or has extra files or fields, then a 4xx', async () => {
    const raw = (body: string | Buffer, type = 'multipart/form-data; boundary=XyZ') => api().post('/api/sites/mill-lane-bakery/attachments').set(accounts.installer.auth).set('Content-Type', type).send(body);
    const png = Buffer.from('89504e470d0a1a0a0000000d49484452000000010000000108060000001f15c4890000000d49444154789c63000100000500010d0a2db40000000049454e44ae426082', 'hex');
    const part = (name: string, value: string | Buffer, filename?: string) => Buffer.concat([Buffer.from(`--XyZ\r\nContent-Disposition: form-data; name="${name}"${filename ? `; filename="${filename}"` : ''}\r\n${filename ? 'Content-Type: image/png\r\n' : ''}\r\n`), Buffer.from(value), Buffer.from('\r\n')]);
    const cases: [string | Buffer, number[], string?][] = [
      ['garbage without any boundary', [400]],
      ['--XyZ\r\nContent-Disposition: form-data; name="file"; filename="a.png"\r\n\r\n\x89PNG', [400]],
      [Buffer.concat([part('file', png, 'a.png'), part('file', png, 'b.png'), Buffer.from('--XyZ--\r\n')]), [400]],
      [Buffer.concat([part('other', png, 'a.png'), Buffer.from('--XyZ--\r\n')]), [400]],
      [Buffer.concat([part('caption', 'c'.repeat(5000)), part('file', png, 'a.png'), Buffer.from('--XyZ--\r\n')]), [400, 413]],
      [Buffer.concat([...Array.from({ length: 10 }, (_, i) => part(`f${i}`, 'x')), part('file', png, 'a.png'), Buffer.from('--XyZ--\r\n')]), [400, 413]],
      [Buffer.concat([part('caption', 'only a caption'), Buffer.from('--XyZ--\r\n')]), [400]],
      ['{}', [415], 'application/json'],
      [png, [415], 'image/png'],
    ];
    for (const [body, statuses, type] of cases) expectRefused(await raw(body, type), statuses);
  });
});

describe('hostile query strings and route ids', () => {
  it('When list and log queries carry SQL, markup, arrays or absurd numbers, then 200 or 400, never 5xx, and nothing leaks', async () => {
    const value = fc.oneof(fc.constantFrom(...ID_FRAGMENTS, '-1', '0', '1e9', 'NaN', 'Infinity', '__proto__', '%', '_'), fc.string({ maxLength: 20 }));
    const key = fc.constantFrom('q', 'page', 'limit', 'sort', 'state', 'status', 'site', 'actor', 'action', 'from', 'to', '__proto__', 'constructor');
    await fc.assert(fc.asyncProperty(fc.constantFrom('/api/sites', '/api/audit', '/api/audit.csv'), fc.array(fc.tuple(key, value), { minLength: 1, maxLength: 4 }), async (route, pairs) => {
      const qs = pairs.map(([k, v]) => `${encodeURIComponent(k)}=${encodeURIComponent(v)}`).join('&');
      const res = await api().get(`${route}?${qs}`).set(accounts.lead.auth);
      expect([200, 400], `${route}?${qs}: ${res.text.slice(0, 200)}`).toContain(res.status);
      if (res.status === 400) expectRefused(res, [400]);
    }), RUNS);
    // The search is a plain substring: SQL in it matches nothing, it does not widen the list.
    const injected = await api().get('/api/sites').query({ q: "' OR '1'='1" }).set(accounts.lead.auth).expect(200);
    expect(injected.body.total).toBe(0);
  });

  it('When a site, revision or attachment id is a path or SQL fragment, then 404 (or 400), never 5xx', async () => {
    await fc.assert(fc.asyncProperty(fc.constantFrom('/api/sites/%s', '/api/sites/%s/revisions', '/api/sites/%s/attachments', '/api/revisions/%s', '/api/attachments/%s/content'), arbitraries.hostileSegment, async (pattern, segment) => {
      const res = await api().get(pattern.replace('%s', encodeURIComponent(segment))).set(accounts.auditor.auth);
      expectRefused(res, [400, 404]);
    }), RUNS);
  });
});

/** RFC 4180 rows: quoted cells may hold commas, quotes ("") and line breaks. */
function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (quoted && ch === '"' && text[i + 1] === '"') {
      cell += '"';
      i++;
    } else if (ch === '"') {
      quoted = !quoted;
    } else if (!quoted && ch === ',') {
      row.push(cell);
      cell = '';
    } else if (!quoted && ch === '\r' && text[i + 1] === '\n') {
      row.push(cell);
      rows.push(row);
      row = [];
      cell = '';
      i++;
    } else {
      cell += ch;
    }
  }
  return rows;
}

describe('formulas in the change-log export', () => {
  it('When someone without an account signs in as "=HYPERLINK(…)", then the auditor\'s CSV shows it as text, not a formula', async () => {
    // Anyone can write a failed sign-in into the log, so its e-mail cell is attacker-controlled.
    const formulas = ['=HYPERLINK("http://example.test/x","open")', '+1+1', '-2+3', '@SUM(A1:A9)'];
    for (const email of formulas) await api().post('/api/auth/login').send({ email, password: 'x' }).expect(401);
    const csv = await api().get('/api/audit.csv').query({ action: 'auth.login-failed' }).set(accounts.auditor.auth).expect(200);
    expect(csv.headers['content-type']).toMatch(/^text\/csv/);
    expect(csv.headers['content-disposition']).toMatch(/^attachment;/);
    const [header, ...rows] = parseCsv(csv.text);
    const emails = rows.map((r) => r[header.indexOf('actor_email')]);
    for (const email of formulas) {
      // The server keeps e-mail addresses in lower case; the cell gets a leading apostrophe.
      expect(emails, email).toContain(`'${email.toLowerCase()}`);
    }
    for (const cell of rows.flat()) expect(cell).not.toMatch(/^[=+\-@\t\r]/);
  });
});

describe('markup in names', () => {
  it('When a site, message and caption carry HTML, then it is stored and answered as JSON text, byte for byte', async () => {
    const name = HTML_NAMES[1];
    const text = FIXTURE.replace('id: mill-lane-bakery', 'id: markup-site').replace('name: Mill Lane Bakery', `name: ${JSON.stringify(name)}`);
    const pushed = await push(weir, accounts.installer, text, HTML_NAMES[0]).expect(201);
    try {
      const site = await api().get('/api/sites/markup-site').set(accounts.lead.auth).expect(200);
      expect(site.headers['content-type']).toMatch(/^application\/json/);
      expect(site.headers['x-content-type-options']).toBe('nosniff');
      expect(site.body.site.name).toBe(name);
      const revision = await api().get(`/api/revisions/${pushed.body.revision.id}`).set(accounts.lead.auth).expect(200);
      expect(revision.body.revision.message).toBe(HTML_NAMES[0]);
      // The reviewer renders these as text: tests/security/reviewer-markup.test.ts.
    } finally {
      before = await state(weir);
    }
  });
});
