// Who may do what: the roles, what each role may do, and every route with the permission it
// needs. Routers mount routes from ROUTES by id (lib/route.ts), so this table is the whole truth,
// and a test can walk it for a route × role matrix.

export const ROLES = ['installer', 'lead', 'auditor', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = [
  'sites:read',
  'revisions:push',
  'revisions:review',
  'attachments:upload',
  'audit:read',
  'users:manage',
  'outbox:read',
] as const;
export type Permission = (typeof PERMISSIONS)[number];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  installer: ['sites:read', 'revisions:push', 'attachments:upload'],
  lead: ['sites:read', 'revisions:push', 'attachments:upload', 'revisions:review', 'audit:read'],
  auditor: ['sites:read', 'audit:read'],
  admin: ['sites:read', 'audit:read', 'users:manage', 'outbox:read'],
};

/** `public`: no token needed; `signed-in`: any valid token, whatever the role. */
export type Access = 'public' | 'signed-in' | Permission;

export interface RouteSpec {
  id: string;
  method: 'GET' | 'POST' | 'PATCH';
  path: string;
  permission: Access;
}

export const ROUTES = [
  { id: 'health', method: 'GET', path: '/api/health', permission: 'public' },
  { id: 'auth.login', method: 'POST', path: '/api/auth/login', permission: 'public' },
  { id: 'me.get', method: 'GET', path: '/api/me', permission: 'signed-in' },
  { id: 'me.password', method: 'POST', path: '/api/me/password', permission: 'signed-in' },
  { id: 'users.list', method: 'GET', path: '/api/users', permission: 'users:manage' },
  { id: 'users.create', method: 'POST', path: '/api/users', permission: 'users:manage' },
  { id: 'users.update', method: 'PATCH', path: '/api/users/:id', permission: 'users:manage' },
  { id: 'users.password', method: 'POST', path: '/api/users/:id/password', permission: 'users:manage' },
  { id: 'revisions.push', method: 'POST', path: '/api/revisions', permission: 'revisions:push' },
  { id: 'revisions.get', method: 'GET', path: '/api/revisions/:id', permission: 'sites:read' },
  { id: 'revisions.review', method: 'POST', path: '/api/revisions/:id/review', permission: 'revisions:review' },
  { id: 'sites.list', method: 'GET', path: '/api/sites', permission: 'sites:read' },
  { id: 'sites.get', method: 'GET', path: '/api/sites/:id', permission: 'sites:read' },
  { id: 'sites.revisions', method: 'GET', path: '/api/sites/:id/revisions', permission: 'sites:read' },
  { id: 'attachments.list', method: 'GET', path: '/api/sites/:id/attachments', permission: 'sites:read' },
  { id: 'attachments.upload', method: 'POST', path: '/api/sites/:id/attachments', permission: 'attachments:upload' },
  { id: 'attachments.content', method: 'GET', path: '/api/attachments/:id/content', permission: 'sites:read' },
  { id: 'audit.list', method: 'GET', path: '/api/audit', permission: 'audit:read' },
  { id: 'audit.csv', method: 'GET', path: '/api/audit.csv', permission: 'audit:read' },
  { id: 'audit.verify', method: 'GET', path: '/api/audit/verify', permission: 'audit:read' },
  { id: 'outbox.list', method: 'GET', path: '/api/outbox', permission: 'outbox:read' },
] as const satisfies readonly RouteSpec[];

export type RouteId = (typeof ROUTES)[number]['id'];

export function isRole(value: unknown): value is Role {
  return typeof value === 'string' && (ROLES as readonly string[]).includes(value);
}

export function can(role: Role, permission: Permission): boolean {
  return ROLE_PERMISSIONS[role].includes(permission);
}

/** The roles a route admits (every role for `signed-in`; none needed for `public`). */
export function rolesAllowed(access: Access): Role[] {
  if (access === 'public' || access === 'signed-in') return [...ROLES];
  return ROLES.filter((r) => can(r, access));
}
