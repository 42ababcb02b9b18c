// Forged and stale credentials, password storage, the sign-in rate limit and user enumeration.
// Tokens are HS256 JWTs carrying only the account id and its token version (server/auth); the
// role is read from the database on every request, so nothing in a token can raise it.
import jwt from 'jsonwebtoken';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { accountsByRole, PASSWORD, startWeir, type Account, type TestWeir } from './support/in-process.ts';
import type { Role } from '../../server/auth/permissions.ts';

const b64url = (value: unknown) => Buffer.from(typeof value === 'string' ? value : JSON.stringify(value)).toString('base64url');
const now = () => Math.floor(Date.now() / 1000);

let weir: TestWeir;
let accounts: Record<Role, Account>;
const api = () => request(weir.app);
/** An admin-only route: a 200 here would mean the forged token got through. */
const asAdmin = (token: string) => api().get('/api/users').set('Authorization', `Bearer ${token}`);

beforeAll(async () => {
  weir = await startWeir();
  accounts = await accountsByRole(weir);
});
afterAll(() => weir?.close());

function expectUnauthenticated(res: request.Response) {
  expect(res.status).toBe(401);
  expect(res.body.error.code).toBe('unauthenticated');
  expect(res.headers['www-authenticate']).toBe('Bearer');
}

describe('forged tokens', () => {
  it('When a token says alg "none" with no signature, in any spelling, then 401', async () => {
    for (const alg of ['none', 'None', 'NONE', 'nOnE']) {
      const header = b64url({ alg, typ: 'JWT' });
      const payload = b64url({ sub: String(accounts.admin.id), tv: 0, iat: now(), exp: now() + 3600 });
      for (const token of [`${header}.${payload}.`, `${header}.${payload}`]) expectUnauthenticated(await asAdmin(token));
    }
  });

  it('When a token is signed with another secret, then 401', async () => {
    const token = jwt.sign({ tv: 0 }, 'another-secret-of-the-same-length-0123456789', { algorithm: 'HS256', subject: String(accounts.admin.id), expiresIn: 3600 });
    expectUnauthenticated(await asAdmin(token));
  });

  it('When a token is signed with the right secret but another HMAC algorithm, then 401 (HS256 is pinned)', async () => {
    for (const algorithm of ['HS384', 'HS512'] as const) {
      const token = jwt.sign({ tv: 0 }, weir.config.jwtSecret, { algorithm, subject: String(accounts.admin.id), expiresIn: 3600 });
      expectUnauthenticated(await asAdmin(token));
    }
  });

  it('When an installer\'s valid token has its payload edited (another account, a role claim), then 401', async () => {
    const [header, , signature] = accounts.installer.token.split('.');
    const claims = jwt.decode(accounts.installer.token) as Record<string, unknown>;
    for (const edited of [{ ...claims, sub: String(accounts.admin.id) }, { ...claims, role: 'admin' }, { ...claims, exp: now() + 365 * 86400 }]) {
      expectUnauthenticated(await asAdmin(`${header}.${b64url(edited)}.${signature}`));
    }
  });

  it('When a correctly signed token claims a role, then the role in the database still decides (403)', async () => {
    const token = jwt.sign({ tv: 0, role: 'admin' }, weir.config.jwtSecret, { algorithm: 'HS256', subject: String(accounts.installer.id), expiresIn: 3600 });
    const res = await asAdmin(token);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('When a correctly signed token names no account or a strange one, then 401, never 5xx', async () => {
    for (const sub of ['999999', '0', '-1', '1e3', '../1', "1 OR 1=1", '__proto__', '9007199254740993']) {
      const token = jwt.sign({ tv: 0 }, weir.config.jwtSecret, { algorithm: 'HS256', subject: sub, expiresIn: 3600 });
      expectUnauthenticated(await asAdmin(token));
    }
  });

  it('When a token has expired, or is not valid yet, then 401 and the message says so', async () => {
    const expired = jwt.sign({ tv: 0, exp: now() - 10 }, weir.config.jwtSecret, { algorithm: 'HS256', subject: String(accounts.admin.id) });
    const res = await asAdmin(expired);
    expectUnauthenticated(res);
    expect(res.body.error.message).toMatch(/expired/);
    const early = jwt.sign({ tv: 0 }, weir.config.jwtSecret, { algorithm: 'HS256', subject: String(accounts.admin.id), expiresIn: 7200, notBefore: 3600 });
    expectUnauthenticated(await asAdmin(early));
  });

  it('When the Authorization header is malformed or the token travels elsewhere, then 401, never 5xx', async () => {
    const token = accounts.admin.token;
    for (const header of ['', 'Bearer', 'Bearer ', `Basic ${b64url('admin@example.test:x')}`, `Bearer ${token} ${token}`, `Token ${token}`, 'Bearer a.b.c', `Bearer ${'A'.repeat(8000)}`, 'Bearer ..', 'Bearer \u00e9.\u00e9.\u00e9']) {
      const req = api().get('/api/users');
      const res = await (header ? req.set('Authorization', header) : req);
      expect(res.status, header.slice(0, 40)).toBe(401);
    }
    // Only the header counts: not the query string, not a cookie.
    expect((await api().get('/api/users').query({ token })).status).toBe(401);
    expect((await api().get('/api/users').query({ access_token: token })).status).toBe(401);
    expect((await api().get('/api/users').set('Cookie', `token=${token}`)).status).toBe(401);
  });
});

describe('other origins', () => {
  it('When a page on another origin calls the API or asks first (CORS preflight), then no header lets it read the answer', async () => {
    const origin = 'http://attacker.example.test';
    const simple = await api().get('/api/me').set('Origin', origin).set(accounts.lead.auth);
    const preflight = await api().options('/api/revisions').set('Origin', origin).set('Access-Control-Request-Method', 'POST').set('Access-Control-Request-Headers', 'authorization,content-type');
    for (const res of [simple, preflight]) {
      expect(res.headers['access-control-allow-origin']).toBeUndefined();
      expect(res.headers['access-control-allow-credentials']).toBeUndefined();
      expect(res.headers['access-control-allow-headers']).toBeUndefined();
    }
    // The token travels only in a header a script must set, so no cookie rides along either.
    expect(simple.headers['set-cookie']).toBeUndefined();
  });
});

describe('stale tokens', () => {
  it('When an account is disabled, then its token stops at once and it cannot sign in (same answer as a wrong password)', async () => {
    const created = await api().post('/api/users').set(accounts.admin.auth).send({ email: 'leaver@example.test', name: 'Leaver', role: 'lead', password: PASSWORD }).expect(201);
    const signIn = await api().post('/api/auth/login').send({ email: 'leaver@example.test', password: PASSWORD }).expect(200);
    const auth = { Authorization: `Bearer ${signIn.body.token}` };
    await api().get('/api/me').set(auth).expect(200);

    await api().patch(`/api/users/${created.body.user.id}`).set(accounts.admin.auth).send({ disabled: true }).expect(200);
    expectUnauthenticated(await api().get('/api/me').set(auth));
    expectUnauthenticated(await api().get('/api/audit').set(auth));

    const again = await api().post('/api/auth/login').send({ email: 'leaver@example.test', password: PASSWORD });
    const wrong = await api().post('/api/auth/login').send({ email: accounts.lead.email, password: 'not-the-password' });
    expect(again.status).toBe(401);
    expect(again.body).toEqual(wrong.body);
  });

  it('When an admin sets a new password, then the tokens issued before stop working', async () => {
    const created = await api().post('/api/users').set(accounts.admin.auth).send({ email: 'reset@example.test', name: 'Reset', role: 'auditor', password: PASSWORD }).expect(201);
    const signIn = await api().post('/api/auth/login').send({ email: 'reset@example.test', password: PASSWORD }).expect(200);
    await api().post(`/api/users/${created.body.user.id}/password`).set(accounts.admin.auth).send({ password: 'a-brand-new-password-9' }).expect(200);
    expectUnauthenticated(await api().get('/api/me').set('Authorization', `Bearer ${signIn.body.token}`));
  });
});

describe('password storage', () => {
  it('When accounts are stored, then each password is a bcrypt hash of cost 10 or more, salted, never the password', async () => {
    const rows = await weir.runtime.db.sequelize.query<{ email: string; password_hash: string }>('SELECT email, password_hash FROM users', { type: QueryTypes.SELECT });
    expect(rows.length).toBeGreaterThanOrEqual(4);
    const salts = new Set<string>();
    for (const { email, password_hash: hash } of rows) {
      // $2a$/$2b$/$2y$ then a two-digit cost; OWASP Password Storage Cheat Sheet: bcrypt cost >= 10.
      const m = /^\$2[aby]\$(\d{2})\$([./A-Za-z0-9]{22})[./A-Za-z0-9]{31}$/.exec(hash);
      expect(m, email).not.toBeNull();
      expect(Number(m![1]), email).toBeGreaterThanOrEqual(10);
      expect(hash).not.toContain(PASSWORD);
      salts.add(m![2]);
    }
    expect(salts.size).toBe(rows.length);
  });

  it('When accounts are listed or signed in, then no answer carries a hash or a password', async () => {
    const bodies = [
      (await api().get('/api/users').set(accounts.admin.auth).expect(200)).text,
      (await api().get('/api/me').set(accounts.lead.auth).expect(200)).text,
      (await api().post('/api/auth/login').send({ email: accounts.auditor.email, password: PASSWORD }).expect(200)).text,
    ];
    for (const text of bodies) {
      expect(text).not.toMatch(/"password|passwordHash|password_hash|\$2[aby]\$/i);
    }
  });
});

describe('sign-in', () => {
  it('When the address is unknown, the password wrong or the account disabled, then the same status, body and headers', async () => {
    const unknown = await api().post('/api/auth/login').send({ email: 'nobody-here@example.test', password: 'whatever-it-is' });
    const wrong = await api().post('/api/auth/login').send({ email: accounts.lead.email, password: 'whatever-it-is' });
    expect(unknown.status).toBe(401);
    expect(unknown.body).toEqual(wrong.body);
    const shape = (r: request.Response) => Object.keys(r.headers).filter((h) => !['date', 'etag', 'content-length'].includes(h)).sort();
    expect(shape(unknown)).toEqual(shape(wrong));
  });

  it('When the address is unknown, then the answer takes about as long as for a wrong password (bcrypt runs either way)', async () => {
    const time = async (email: string) => {
      const t0 = performance.now();
      await api().post('/api/auth/login').send({ email, password: 'a-wrong-password' }).expect(401);
      return performance.now() - t0;
    };
    await time('warm-up@example.test');
    const unknown: number[] = [];
    const wrong: number[] = [];
    for (let i = 0; i < 7; i++) {
      unknown.push(await time(`nobody-${i}@example.test`));
      wrong.push(await time(accounts.installer.email));
    }
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];
    const [u, w] = [median(unknown), median(wrong)];
    // A skipped bcrypt would answer in about a millisecond against tens for cost 10: a factor of
    // two either way leaves room for a busy machine and still catches that.
    expect(u / w).toBeGreaterThan(0.5);
    expect(u / w).toBeLessThan(2);
  });

  it('When failed sign-ins from one address pass the limit, then 429, even with the right password and a forged X-Forwarded-For', async () => {
    // A second app on the same database with a limit of 3: the limiter lives in the app.
    const limited = createApp({ ...weir.runtime, config: { ...weir.config, loginRateLimit: 3 } });
    const attempt = (password: string, forwardedFor?: string) => {
      const req = request(limited).post('/api/auth/login');
      if (forwardedFor) req.set('X-Forwarded-For', forwardedFor);
      return req.send({ email: accounts.lead.email, password });
    };
    for (let i = 0; i < 3; i++) expect((await attempt('wrong-password')).status).toBe(401);
    const blocked = await attempt(PASSWORD);
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate-limited');
    expect(blocked.body.error.message).toMatch(/try again/);
    // Without WEIR_TRUST_PROXY the header is not believed, so it cannot reset the count.
    expect((await attempt(PASSWORD, '203.0.113.7')).status).toBe(429);
  });
});
