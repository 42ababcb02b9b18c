import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Page, SiteListItem, SiteStatus } from '../../../types/api.ts';

export type SiteSort = 'name' | '-name' | 'updated' | '-updated' | 'errors' | '-errors';

export interface SitesParams {
  page: number;
  limit: number;
  q: string;
  state: SiteStatus | '';
  sort: SiteSort;
}

export const SITE_STATES: readonly SiteStatus[] = ['pending', 'approved', 'returned', 'never-approved'];
const SORTS: readonly SiteSort[] = ['name', '-name', 'updated', '-updated', 'errors', '-errors'];

/** The list's state lives in the URL, so back/forward and a reload keep it. */
export function sitesParamsFrom(search: URLSearchParams): SitesParams {
  const page = Math.max(1, Number.parseInt(search.get('page') ?? '1', 10) || 1);
  const state = search.get('state') ?? '';
  const sort = search.get('sort') ?? '-updated';
  return {
    page,
    limit: 20,
    q: search.get('q') ?? '',
    state: (SITE_STATES as readonly string[]).includes(state) ? (state as SiteStatus) : '',
    sort: (SORTS as readonly string[]).includes(sort) ? (sort as SiteSort) : '-updated',
  };
}

export function getSites(params: SitesParams, signal?: AbortSignal): Promise<Page<SiteListItem>> {
  return api<Page<SiteListItem>>('/sites', { query: { ...params }, signal });
}

export const sitesQueryOptions = (params: SitesParams) =>
  queryOptions({
    queryKey: ['sites', 'list', params],
    queryFn: ({ signal }) => getSites(params, signal),
  });

export function useSites(params: SitesParams) {
  return useQuery({ ...sitesQueryOptions(params), placeholderData: keepPreviousData });
}
