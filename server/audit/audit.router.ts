import type { JSONSchemaType } from 'ajv';
import { Router } from 'express';
import { AppError } from '../lib/app-error.ts';
import type { MountRoute } from '../lib/route.ts';
import { queryChecker } from '../lib/validate.ts';
import type { AuditEventView, AuditFilters, AuditService } from './audit.service.ts';

interface ListQuery extends AuditFilters {
  page: number;
  limit: number;
}

const text = { type: 'string', minLength: 1, maxLength: 254, nullable: true } as const;
const filterProperties = { site: text, actor: text, action: text, from: text, to: text };

const listQuery: JSONSchemaType<ListQuery> = {
  type: 'object',
  properties: { ...filterProperties, page: { type: 'integer', minimum: 1, maximum: 1_000_000, default: 1 }, limit: { type: 'integer', minimum: 1, maximum: 200, default: 50 } },
  required: [],
  additionalProperties: true,
};
const filterQuery: JSONSchemaType<AuditFilters> = { type: 'object', properties: filterProperties, required: [], additionalProperties: true };

const checkList = queryChecker(listQuery);
const checkFilters = queryChecker(filterQuery);

/** from/to must be dates; an unreadable one is a 400, not an empty list. */
function checkTimes<T extends AuditFilters>(q: T): T {
  for (const key of ['from', 'to'] as const) {
    const value = q[key];
    if (value !== undefined && Number.isNaN(Date.parse(value))) throw new AppError(400, 'invalid-query', `${key} must be a date or time such as 2026-05-01 or 2026-05-01T08:00:00Z`, [{ path: key, message: 'is not a date' }]);
  }
  return q;
}

const CSV_COLUMNS = ['seq', 'at', 'actor_id', 'actor_email', 'action', 'site_id', 'revision_id', 'details', 'prev_hash', 'hash'];

/** RFC 4180 quoting; a cell a spreadsheet would run as a formula gets a leading apostrophe. */
function csvCell(value: unknown): string {
  let s = value === null || value === undefined ? '' : typeof value === 'string' ? value : JSON.stringify(value);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replaceAll('"', '""')}"` : s;
}

const csvRow = (e: AuditEventView) =>
  [e.seq, e.at, e.actor?.id ?? null, e.actor?.email ?? null, e.action, e.siteId, e.revisionId, e.details, e.prevHash, e.hash].map(csvCell).join(',') + '\r\n';

export function auditRouter(mount: MountRoute, audit: AuditService, now: () => Date) {
  const router = Router();

  mount(router, 'audit.list', async (req, res) => {
    const { page, limit, ...filters } = checkTimes(checkList(req.query));
    res.json(await audit.list(filters, page, limit));
  });

  mount(router, 'audit.csv', async (req, res) => {
    const filters = checkTimes(checkFilters(req.query));
    const stamp = now().toISOString().slice(0, 10);
    res.set('Content-Type', 'text/csv; charset=utf-8');
    res.set('Content-Disposition', `attachment; filename="weir-change-log-${stamp}.csv"`);
    res.write(CSV_COLUMNS.join(',') + '\r\n');
    for await (const event of audit.all(filters)) res.write(csvRow(event));
    res.end();
  });

  mount(router, 'audit.verify', async (_req, res) => {
    res.json(await audit.verify());
  });

  return router;
}
