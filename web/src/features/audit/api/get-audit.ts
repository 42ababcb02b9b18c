import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { AuditEvent } from '../../../types/api.ts';

export interface AuditFilters {
  site: string;
  actor: string;
  action: string;
  from: string;
  to: string;
}

export interface AuditParams extends AuditFilters {
  page: number;
  limit: number;
}

export const AUDIT_FILTER_KEYS: readonly (keyof AuditFilters)[] = ['site', 'actor', 'action', 'from', 'to'];

export function auditParamsFrom(search: URLSearchParams): AuditParams {
  const get = (k: string) => search.get(k) ?? '';
  return {
    site: get('site'),
    actor: get('actor'),
    action: get('action'),
    from: get('from'),
    to: get('to'),
    page: Math.max(1, Number.parseInt(search.get('page') ?? '1', 10) || 1),
    limit: 25,
  };
}

/** Dates from the form are whole days; `to` includes the whole of its day. */
export function auditQuery(filters: AuditFilters): Record<string, string> {
  const out: Record<string, string> = {};
  if (filters.site) out.site = filters.site;
  if (filters.actor) out.actor = filters.actor;
  if (filters.action) out.action = filters.action;
  if (filters.from) out.from = new Date(`${filters.from}T00:00:00`).toISOString();
  if (filters.to) out.to = new Date(`${filters.to}T23:59:59.999`).toISOString();
  return out;
}

export function getAudit(params: AuditParams, signal?: AbortSignal): Promise<{ items: AuditEvent[]; total: number }> {
  return api('/audit', { query: { ...auditQuery(params), page: params.page, limit: params.limit }, signal });
}

export const auditQueryOptions = (params: AuditParams) =>
  queryOptions({ queryKey: ['audit', 'list', params], queryFn: ({ signal }) => getAudit(params, signal) });

export function useAudit(params: AuditParams) {
  return useQuery({ ...auditQueryOptions(params), placeholderData: keepPreviousData });
}
