// The route × role matrix, generated from the routes Express really has registered on the app
// (walked from `app.router.stack`), not from a list kept by hand: a route mounted without an
// entry in the permission table (server/auth/permissions.ts), or whose permission drifts from
// the API contract (DEVELOPERS.md, "API contract"), fails here before any request is made.
import express, { Router, type Express } from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, ROUTES, rolesAllowed, type Role, type RouteSpec } from '../../server/auth/permissions.ts';
import { accountsByRole, push, siteText, startWeir, type Account, type TestWeir } from './support/in-process.ts';

/**
 * Who may call each route, copied from DEVELOPERS.md's contract table: a second, independent
 * statement of the permissions. "anyone" routes need no token; "signed in" admits every role.
 */
const CONTRACT: Record<string, 'anyone' | Role[]> = {
  'GET /api/health': 'anyone',
  'POST /api/auth/login': 'anyone',
  'GET /api/me': ['installer', 'lead', 'auditor', 'admin'],
  'POST /api/me/password': ['installer', 'lead', 'auditor', 'admin'],
  'GET /api/users': ['admin'],
  'POST /api/users': ['admin'],
  'PATCH /api/users/:id': ['admin'],
  'POST /api/users/:id/password': ['admin'],
  'POST /api/revisions': ['installer', 'lead'],
  'GET /api/sites': ['installer', 'lead', 'auditor', 'admin'],
  'GET /api/sites/:id': ['installer', 'lead', 'auditor', 'admin'],
  'GET /api/sites/:id/revisions': ['installer', 'lead', 'auditor', 'admin'],
  'GET /api/revisions/:id': ['installer', 'lead', 'auditor', 'admin'],
  'POST /api/revisions/:id/review': ['lead'],
  'GET /api/sites/:id/attachments': ['installer', 'lead', 'auditor', 'admin'],
  'POST /api/sites/:id/attachments': ['installer', 'lead'],
  'GET /api/attachments/:id/content': ['installer', 'lead', 'auditor', 'admin'],
  'GET /api/audit': ['auditor', 'lead', 'admin'],
  'GET /api/audit.csv': ['auditor', 'lead', 'admin'],
  'GET /api/audit/verify': ['auditor', 'lead', 'admin'],
  'GET /api/outbox': ['admin'],
};

interface Layer {
  name?: string;
  rawPath?: string;
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
}

/** Every `METHOD path` Express would answer with a route handler, nested routers included. */
export function registeredRoutes(app: Express): string[] {
  const out: string[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          // Express answers HEAD through the GET handler; `_all` is app.all().
          if (on && method !== 'head') out.push(`${method === '_all' ? 'ALL' : method.toUpperCase()} ${prefix}${layer.route.path}`);
        }
      } else if (layer.handle?.stack) {
        const mountedAt = layer.rawPath && layer.rawPath !== '/' ? layer.rawPath : '';
        walk(layer.handle.stack, prefix + mountedAt);
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return out;
}

const tableKey = (r: RouteSpec) => `${r.method} ${r.path}`;
const TABLE = new Map((ROUTES as readonly RouteSpec[]).map((r) => [tableKey(r), r]));

/** Registered routes that have no entry in the permission table. */
const undeclared = (app: Express) => registeredRoutes(app).filter((key) => !TABLE.has(key));

let weir: TestWeir;
let accounts: Record<Role, Account>;
const ids: Record<string, string> = {};

beforeAll(async () => {
  weir = await startWeir();
  accounts = await accountsByRole(weir);
  const pushed = await push(weir, accounts.installer, await siteText()).expect(201);
  const upload = await request(weir.app)
    .post('/api/sites/mill-lane-bakery/attachments')
    .set(accounts.installer.auth)
    .attach('file', Buffer.from('%PDF-1.4\n%%EOF\n'), { filename: 'report.pdf', contentType: 'application/pdf' })
    .expect(201);
  Object.assign(ids, { sites: 'mill-lane-bakery', revisions: String(pushed.body.revision.id), users: String(accounts.installer.id), attachments: String(upload.body.attachment.id) });
});
afterAll(() => weir?.close());

/** The path with each :id filled from the resource named before it. */
const concrete = (path: string) => path.replace(/\/(\w+)\/:id/g, (_m, resource: string) => `/${resource}/${ids[resource]}`);

/** An empty JSON body: enough to get past the guard, never enough to change anything. */
function call(method: string, path: string, auth?: { Authorization: string }) {
  const api = request(weir.app);
  const target = concrete(path);
  const req = method === 'GET' ? api.get(target) : method === 'POST' ? api.post(target) : method === 'PATCH' ? api.patch(target) : api.delete(target);
  if (auth) req.set(auth);
  return method === 'GET' ? req : req.send({});
}

describe('the route table is the whole truth', () => {
  it('When the app is built, then every route Express registered has an entry in the permission table', () => {
    const routes = registeredRoutes(weir.app);
    expect(routes.length).toBeGreaterThanOrEqual(ROUTES.length);
    expect(undeclared(weir.app), 'routes without a declared permission').toEqual([]);
  });

  it('When the table is read, then each of its routes is registered exactly once', () => {
    const routes = registeredRoutes(weir.app);
    for (const key of TABLE.keys()) expect(routes.filter((r) => r === key), key).toHaveLength(1);
  });

  it('When someone mounts a route outside the table, then the check above names it', () => {
    // The same walk over an app with one extra route, as a careless change would add it.
    const app = express();
    app.use((weir.app as unknown as { router: unknown }).router as express.RequestHandler);
    const extra = Router();
    extra.delete('/api/sites/:id', (_req, res) => { res.json({ deleted: true }); });
    app.use('/', extra);
    expect(undeclared(app)).toEqual(['DELETE /api/sites/:id']);
  });

  it('When the table is compared with the API contract, then every route is in it with the same roles', () => {
    for (const route of ROUTES as readonly RouteSpec[]) {
      const contract = CONTRACT[tableKey(route)];
      expect(contract, `${tableKey(route)} is not in the API contract (DEVELOPERS.md)`).toBeDefined();
      if (contract === 'anyone') expect(route.permission, tableKey(route)).toBe('public');
      else expect([...rolesAllowed(route.permission)].sort(), tableKey(route)).toEqual([...contract].sort());
    }
    expect(Object.keys(CONTRACT).sort()).toEqual([...TABLE.keys()].sort());
  });
});

describe('route × role (and no token)', () => {
  const callers: (Role | 'no token')[] = ['no token', ...ROLES];
  // Generated from the table; the first describe proves the table equals what is registered.
  for (const route of ROUTES as readonly RouteSpec[]) {
    const allowed = rolesAllowed(route.permission);
    for (const caller of callers) {
      const expected = route.permission === 'public' ? 'through' : caller === 'no token' ? 401 : allowed.includes(caller) ? 'through' : 403;
      it(`When ${caller === 'no token' ? 'nobody signed in' : `a ${caller}`} calls ${route.method} ${route.path}, then ${expected === 'through' ? 'it gets past the guard' : expected}`, async () => {
        const res = await call(route.method, route.path, caller === 'no token' ? undefined : accounts[caller].auth);
        expect(res.status).toBeLessThan(500);
        if (expected === 'through') {
          expect([401, 403]).not.toContain(res.status);
          // The route's own handler answered, not the catch-all 404 of unknown routes.
          expect(res.body?.error?.message ?? '').not.toMatch(/^there is no /);
        } else {
          expect(res.status).toBe(expected);
          expect(res.body.error.code).toBe(expected === 401 ? 'unauthenticated' : 'forbidden');
        }
      });
    }
  }

  it('When nobody signed in sends a large site file or upload, then 401 before the body is read (not 413 or 422)', async () => {
    const yaml = await request(weir.app).post('/api/revisions').set('Content-Type', 'application/yaml').send('x'.repeat(600 * 1024));
    expect(yaml.status).toBe(401);
    const upload = await request(weir.app).post('/api/sites/mill-lane-bakery/attachments').attach('file', Buffer.alloc(11 * 1024 * 1024), { filename: 'big.png', contentType: 'image/png' });
    expect(upload.status).toBe(401);
    // A role that may not upload is turned away before the file is read, too.
    const auditor = await request(weir.app).post('/api/sites/mill-lane-bakery/attachments').set(accounts.auditor.auth).attach('file', Buffer.alloc(11 * 1024 * 1024), { filename: 'big.png', contentType: 'image/png' });
    expect(auditor.status).toBe(403);
  });

  it('When a GET route is asked with HEAD and no token, then 401 as for GET', async () => {
    for (const route of (ROUTES as readonly RouteSpec[]).filter((r) => r.method === 'GET' && r.permission !== 'public')) {
      const res = await request(weir.app).head(concrete(route.path));
      expect(res.status, route.path).toBe(401);
    }
  });

  it('When a path of the table is called with a method it does not list, then 404 for every role, never a 2xx', async () => {
    const paths = [...new Set((ROUTES as readonly RouteSpec[]).map((r) => r.path))];
    for (const path of paths) {
      for (const method of ['GET', 'POST', 'PATCH', 'DELETE']) {
        if (TABLE.has(`${method} ${path}`)) continue;
        const res = await call(method, path, accounts.admin.auth);
        expect(res.status, `${method} ${path}`).toBe(404);
      }
    }
  });

  it('When an unknown /api path is called, with or without a token, then 404 in the error shape', async () => {
    for (const path of ['/api/admin', '/api/users/1/delete', '/api/revisions/1/approve', '/api/debug', '/api/../api/users']) {
      for (const auth of [undefined, accounts.admin.auth]) {
        const res = await call('GET', path, auth);
        expect([401, 404], path).toContain(res.status);
        expect(res.body.error.code).toMatch(/^(not-found|unauthenticated)$/);
      }
    }
  });
});
