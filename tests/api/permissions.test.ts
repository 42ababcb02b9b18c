// The route × role matrix, generated from the one permission table the server mounts its routes
// from: every role the table refuses gets 403, every role it admits gets past the guard, and no
// route answers without a token unless it is public.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, ROUTES, rolesAllowed, type Role, type RouteSpec } from '../../server/auth/permissions.ts';
import { account, push, siteText, startWeir, type Account, type TestWeir } from './helpers.ts';

let weir: TestWeir;
const accounts = {} as Record<Role, Account>;
const ids: Record<string, string> = {};

beforeAll(async () => {
  weir = await startWeir();
  for (const role of ROLES) accounts[role] = await account(weir, role);
  const pushed = await push(weir, accounts.installer, await siteText()).expect(201);
  const upload = await request(weir.app)
    .post('/api/sites/mill-lane-bakery/attachments')
    .set(accounts.installer.auth)
    .attach('file', Buffer.from('%PDF-1.4\n%%EOF\n'), { filename: 'report.pdf', contentType: 'application/pdf' })
    .expect(201);
  Object.assign(ids, { sites: 'mill-lane-bakery', revisions: String(pushed.body.revision.id), users: String(accounts.installer.id), attachments: String(upload.body.attachment.id) });
});
afterAll(() => weir.close());

/** The path with its :id filled from the resource named before it. */
const concrete = (route: RouteSpec) => route.path.replace(/\/(\w+)\/:id/, (_m, resource: string) => `/${resource}/${ids[resource]}`);

/** An empty JSON body: enough to pass the guard, never enough to change anything. */
function call(route: RouteSpec, auth?: { Authorization: string }) {
  const api = request(weir.app);
  const path = concrete(route);
  const req = route.method === 'GET' ? api.get(path) : route.method === 'POST' ? api.post(path) : api.patch(path);
  if (auth) req.set(auth);
  return route.method === 'GET' ? req : req.send({});
}

describe('route × role', () => {
  it('When the table is read, then every route has a permission and a unique method + path', () => {
    const keys = ROUTES.map((r) => `${r.method} ${r.path}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(ROUTES.length).toBeGreaterThanOrEqual(21);
  });

  for (const route of ROUTES as readonly RouteSpec[]) {
    const allowed = rolesAllowed(route.permission);
    for (const role of ROLES) {
      const admitted = allowed.includes(role);
      it(`When ${role} calls ${route.method} ${route.path}, then ${admitted ? 'it gets past the guard' : '403 forbidden'}`, async () => {
        const res = await call(route, accounts[role].auth);
        if (!admitted) {
          expect(res.status).toBe(403);
          expect(res.body.error.code).toBe('forbidden');
          return;
        }
        expect([401, 403]).not.toContain(res.status);
        expect(res.status).toBeLessThan(500);
        // Reached the route's own handler, not the catch-all 404.
        expect(res.body?.error?.message ?? '').not.toMatch(/^there is no /);
      });
    }
    if (route.permission !== 'public') {
      it(`When nobody is signed in and calls ${route.method} ${route.path}, then 401 unauthenticated`, async () => {
        const res = await call(route);
        expect(res.status).toBe(401);
        expect(res.body.error.code).toBe('unauthenticated');
      });
    }
  }
});
