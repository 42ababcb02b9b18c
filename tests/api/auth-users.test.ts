import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../server/app.ts';
import { loadConfig } from '../../server/config.ts';
import { PASSWORD, account, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
let admin: Account;
let installer: Account;
let lead: Account;

beforeAll(async () => {
  weir = await startWeir();
  admin = await account(weir, 'admin');
  installer = await account(weir, 'installer');
  lead = await account(weir, 'lead');
});
afterAll(() => weir.close());

const api = () => request(weir.app);

describe('health', () => {
  it('When the database is reachable, then /api/health answers 200 { ok: true } without a token', async () => {
    const res = await api().get('/api/health').expect(200);
    expect(res.body).toEqual({ ok: true });
  });
});

describe('sign-in', () => {
  it('When the e-mail and password are right, then it answers a HS256 token with an expiry and the user', async () => {
    const res = await api().post('/api/auth/login').send({ email: 'Installer@Example.test ', password: PASSWORD }).expect(200);
    expect(res.body.user).toMatchObject({ email: 'installer@example.test', role: 'installer', disabled: false });
    expect(res.body.user).not.toHaveProperty('passwordHash');
    const decoded = jwt.decode(res.body.token, { complete: true })!;
    expect(decoded.header.alg).toBe('HS256');
    const payload = decoded.payload as jwt.JwtPayload;
    expect(payload.sub).toBe(String(installer.id));
    // 8 hours: the documented token lifetime.
    expect(payload.exp! - payload.iat!).toBe(8 * 3600);
  });

  it('When the account is unknown or the password wrong, then both get the same 401 invalid-credentials', async () => {
    const unknown = await api().post('/api/auth/login').send({ email: 'nobody@example.test', password: PASSWORD }).expect(401);
    const wrong = await api().post('/api/auth/login').send({ email: 'installer@example.test', password: 'not-the-password' }).expect(401);
    expect(unknown.body).toEqual(wrong.body);
    expect(unknown.body.error.code).toBe('invalid-credentials');
  });

  it('When an unknown account is tried, then the server does as much work as for a wrong password (bcrypt runs either way)', async () => {
    // CPU time of this process (bcryptjs runs in JavaScript here), not wall time: the machine may be busy.
    const cpu = async (email: string) => {
      const start = process.cpuUsage();
      await api().post('/api/auth/login').send({ email, password: 'not-the-password' }).expect(401);
      const used = process.cpuUsage(start);
      return used.user + used.system;
    };
    await cpu('warm-up@example.test');
    const unknown = Math.min(await cpu('nobody@example.test'), await cpu('nobody2@example.test'), await cpu('nobody3@example.test'));
    const wrong = Math.min(await cpu('installer@example.test'), await cpu('installer@example.test'), await cpu('installer@example.test'));
    // bcrypt at cost 10 is most of the work; skipping it for unknown accounts would make that case a small fraction.
    expect(unknown).toBeGreaterThan(wrong * 0.6);
  });

  it('When a sign-in fails, then the change log records it with the reason', async () => {
    await api().post('/api/auth/login').send({ email: 'lead@example.test', password: 'wrong-password-x' }).expect(401);
    const res = await api().get('/api/audit').query({ action: 'auth.login-failed', actor: 'lead@example.test' }).set(lead.auth).expect(200);
    expect(res.body.items[0]).toMatchObject({ action: 'auth.login-failed', actor: { id: lead.id, email: 'lead@example.test' }, details: { reason: 'wrong-password' } });
  });

  it('When the body is malformed, then it answers 400 (JSON), 400 (fields), 415 (type) or 413 (size), never 5xx', async () => {
    const bad = await api().post('/api/auth/login').set('Content-Type', 'application/json').send('{"email": ').expect(400);
    expect(bad.body.error.code).toBe('invalid-json');
    const missing = await api().post('/api/auth/login').send({ email: 'installer@example.test' }).expect(400);
    expect(missing.body.error).toMatchObject({ code: 'invalid-body', details: [{ path: 'password' }] });
    const typed = await api().post('/api/auth/login').send({ email: ['x'], password: 1 }).expect(400);
    expect(typed.body.error.code).toBe('invalid-body');
    const form = await api().post('/api/auth/login').type('form').send('email=a&password=b').expect(415);
    expect(form.body.error.code).toBe('unsupported-media-type');
    const huge = await api().post('/api/auth/login').send({ email: 'a@example.test', password: 'x'.repeat(200 * 1024) }).expect(413);
    expect(huge.body.error.code).toBe('payload-too-large');
  });
});

describe('login rate limit', () => {
  it('When failed sign-ins pass WEIR_LOGIN_RATE_LIMIT, then further attempts get 429 rate-limited', async () => {
    // A second app on the same database, with a limit of 3 (the models allow one database per process).
    const config = loadConfig({ WEIR_LOGIN_RATE_LIMIT: '3' }, { dataDir: weir.dataDir, logLevel: 'silent' });
    const limited = createApp({ ...weir.runtime, config });
    for (let i = 0; i < 3; i++) await request(limited).post('/api/auth/login').send({ email: 'x@example.test', password: 'wrong-password' }).expect(401);
    const res = await request(limited).post('/api/auth/login').send({ email: 'x@example.test', password: 'wrong-password' }).expect(429);
    expect(res.body.error.code).toBe('rate-limited');
    // A right password is refused too while the address is blocked.
    await request(limited).post('/api/auth/login').send({ email: installer.email, password: PASSWORD }).expect(429);
    // The other app (another limiter) is not affected.
    await api().post('/api/auth/login').send({ email: installer.email, password: PASSWORD }).expect(200);
  });
});

describe('tokens', () => {
  it('When a signed-in user asks /api/me, then it answers { user }', async () => {
    const res = await api().get('/api/me').set(installer.auth).expect(200);
    expect(res.body.user).toMatchObject({ id: installer.id, email: installer.email, role: 'installer' });
  });

  it('When the token is missing, malformed, signed with another key, unsigned or expired, then 401 unauthenticated', async () => {
    const secret = weir.config.jwtSecret;
    const claims = { tv: 0 };
    const tokens = [
      undefined,
      'Bearer',
      'Bearer not-a-jwt',
      `Bearer ${jwt.sign(claims, 'some-other-secret-of-enough-length', { subject: String(installer.id) })}`,
      // alg "none": must be refused because verify only accepts HS256.
      `Bearer ${jwt.sign(claims, null as unknown as string, { algorithm: 'none', subject: String(installer.id) })}`,
      `Bearer ${jwt.sign({ ...claims, exp: Math.floor(Date.now() / 1000) - 10 }, secret, { subject: String(installer.id) })}`,
      `Bearer ${jwt.sign(claims, secret, { subject: '999999' })}`,
    ];
    for (const header of tokens) {
      const req = api().get('/api/me');
      if (header) req.set('Authorization', header);
      const res = await req.expect(401);
      expect(res.body.error.code).toBe('unauthenticated');
    }
  });
});

describe('accounts (admin)', () => {
  it('When an admin lists accounts, then every account is there without its hash', async () => {
    const res = await api().get('/api/users').set(admin.auth).expect(200);
    expect(res.body.items.map((u: { email: string }) => u.email)).toEqual(expect.arrayContaining([admin.email, installer.email, lead.email]));
    for (const u of res.body.items) expect(u).not.toHaveProperty('passwordHash');
  });

  it('When an admin creates an account, then 201 { user }, it can sign in, and the log says user.created', async () => {
    const res = await api().post('/api/users').set(admin.auth).send({ email: 'auditor@example.test', name: 'New Auditor', role: 'auditor', password: 'auditor-pass-1' }).expect(201);
    expect(res.body.user).toMatchObject({ email: 'auditor@example.test', role: 'auditor', disabled: false });
    await api().post('/api/auth/login').send({ email: 'auditor@example.test', password: 'auditor-pass-1' }).expect(200);
    const log = await api().get('/api/audit').query({ action: 'user.created' }).set(admin.auth).expect(200);
    expect(log.body.items[0]).toMatchObject({ actor: { id: admin.id }, details: { email: 'auditor@example.test', role: 'auditor' } });
  });

  it('When the new account is bad, then 409 email-taken, 400 invalid-body or 400 weak-password', async () => {
    expect((await api().post('/api/users').set(admin.auth).send({ email: 'LEAD@example.test', name: 'Dup', role: 'lead', password: 'long-enough-1' }).expect(409)).body.error.code).toBe('email-taken');
    expect((await api().post('/api/users').set(admin.auth).send({ email: 'x@example.test', name: 'X', role: 'owner', password: 'long-enough-1' }).expect(400)).body.error.code).toBe('invalid-body');
    expect((await api().post('/api/users').set(admin.auth).send({ email: 'not-an-email', name: 'X', role: 'lead', password: 'long-enough-1' }).expect(400)).body.error.code).toBe('invalid-body');
    expect((await api().post('/api/users').set(admin.auth).send({ email: 'y@example.test', name: 'Y', role: 'lead', password: 'short' }).expect(400)).body.error.code).toBe('weak-password');
  });

  it('When a role changes, then the next request with the same token already has the new role', async () => {
    const temp = await api().post('/api/users').set(admin.auth).send({ email: 'temp@example.test', name: 'Temp', role: 'installer', password: 'temp-pass-123' }).expect(201);
    const login = await api().post('/api/auth/login').send({ email: 'temp@example.test', password: 'temp-pass-123' }).expect(200);
    const auth = { Authorization: `Bearer ${login.body.token}` };
    await api().get('/api/audit').set(auth).expect(403);
    const patched = await api().patch(`/api/users/${temp.body.user.id}`).set(admin.auth).send({ role: 'auditor' }).expect(200);
    expect(patched.body.user.role).toBe('auditor');
    await api().get('/api/audit').set(auth).expect(200);

    // Disabled: the same token stops working at once, and sign-in is refused like a wrong password.
    await api().patch(`/api/users/${temp.body.user.id}`).set(admin.auth).send({ disabled: true }).expect(200);
    expect((await api().get('/api/me').set(auth).expect(401)).body.error.code).toBe('unauthenticated');
    expect((await api().post('/api/auth/login').send({ email: 'temp@example.test', password: 'temp-pass-123' }).expect(401)).body.error.code).toBe('invalid-credentials');
  });

  it('When the patch is bad or names no account, then 400 or 404', async () => {
    await api().patch(`/api/users/${installer.id}`).set(admin.auth).send({}).expect(400);
    await api().patch(`/api/users/${installer.id}`).set(admin.auth).send({ disabled: 'yes' }).expect(400);
    await api().patch('/api/users/999999').set(admin.auth).send({ name: 'Nobody' }).expect(404);
    await api().patch('/api/users/abc').set(admin.auth).send({ name: 'Nobody' }).expect(404);
  });

  it('When the last active admin would be demoted or disabled, then 409 last-admin', async () => {
    const res = await api().patch(`/api/users/${admin.id}`).set(admin.auth).send({ role: 'lead' }).expect(409);
    expect(res.body.error.code).toBe('last-admin');
    await api().patch(`/api/users/${admin.id}`).set(admin.auth).send({ disabled: true }).expect(409);
  });

  it('When an admin sets a password, then the old one and old tokens stop working', async () => {
    const target = await api().post('/api/users').set(admin.auth).send({ email: 'reset@example.test', name: 'Reset', role: 'installer', password: 'first-pass-123' }).expect(201);
    const login = await api().post('/api/auth/login').send({ email: 'reset@example.test', password: 'first-pass-123' }).expect(200);
    await api().post(`/api/users/${target.body.user.id}/password`).set(admin.auth).send({ password: 'second-pass-123' }).expect(200);
    await api().get('/api/me').set('Authorization', `Bearer ${login.body.token}`).expect(401);
    await api().post('/api/auth/login').send({ email: 'reset@example.test', password: 'first-pass-123' }).expect(401);
    await api().post('/api/auth/login').send({ email: 'reset@example.test', password: 'second-pass-123' }).expect(200);
    await api().post('/api/users/999999/password').set(admin.auth).send({ password: 'second-pass-123' }).expect(404);
  });

  it('When someone other than an admin calls an account route, then 403 forbidden', async () => {
    for (const who of [installer, lead]) {
      expect((await api().get('/api/users').set(who.auth).expect(403)).body.error.code).toBe('forbidden');
      await api().post('/api/users').set(who.auth).send({ email: 'z@example.test', name: 'Z', role: 'admin', password: 'zzzz-zzzz-1' }).expect(403);
      await api().patch(`/api/users/${who.id}`).set(who.auth).send({ role: 'admin' }).expect(403);
      await api().post(`/api/users/${who.id}/password`).set(who.auth).send({ password: 'zzzz-zzzz-1' }).expect(403);
    }
  });
});

describe('own password', () => {
  it('When the current password is wrong, then 403 wrong-password; when right, then a fresh token and the old one is void', async () => {
    const me = await account(weir, 'installer', 'changer');
    expect((await api().post('/api/me/password').set(me.auth).send({ currentPassword: 'nope-nope-1', newPassword: 'brand-new-pass-1' }).expect(403)).body.error.code).toBe('wrong-password');
    await api().post('/api/me/password').set(me.auth).send({ currentPassword: PASSWORD }).expect(400);
    const res = await api().post('/api/me/password').set(me.auth).send({ currentPassword: PASSWORD, newPassword: 'brand-new-pass-1' }).expect(200);
    expect(res.body.ok).toBe(true);
    await api().get('/api/me').set(me.auth).expect(401);
    await api().get('/api/me').set('Authorization', `Bearer ${res.body.token}`).expect(200);
    await api().post('/api/auth/login').send({ email: me.email, password: 'brand-new-pass-1' }).expect(200);
  });
});

describe('unknown routes', () => {
  it('When an /api route does not exist, then 404 not-found in the error shape', async () => {
    const res = await api().get('/api/nothing-here').expect(404);
    expect(res.body.error.code).toBe('not-found');
  });
});
