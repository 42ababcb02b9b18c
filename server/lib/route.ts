import type { RequestHandler, Router } from 'express';
import type { AuthService } from '../auth/auth.service.ts';
import { ROUTES, type RouteId } from '../auth/permissions.ts';
import { authorize } from '../middleware/authorize.ts';

export type MountRoute = (router: Router, id: RouteId, ...handlers: RequestHandler[]) => void;

/**
 * Feature routers mount their routes by id: method, path and permission come from the one table
 * in auth/permissions.ts, and the permission check always runs first.
 */
export function createRouteMounter(auth: AuthService) {
  const mounted = new Set<RouteId>();
  const mount: MountRoute = (router, id, ...handlers) => {
    const spec = ROUTES.find((r) => r.id === id);
    if (!spec) throw new Error(`route ${id} is not in the route table`);
    if (mounted.has(id)) throw new Error(`route ${id} is mounted twice`);
    mounted.add(id);
    const method = spec.method.toLowerCase() as 'get' | 'post' | 'patch';
    router[method](spec.path, authorize(auth, spec.permission), ...handlers);
  };
  /** Every route of the table must have a handler: a missing one is a programming error. */
  const assertComplete = () => {
    const missing = ROUTES.filter((r) => !mounted.has(r.id)).map((r) => r.id);
    if (missing.length) throw new Error(`routes without a handler: ${missing.join(', ')}`);
  };
  return { mount, assertComplete };
}
