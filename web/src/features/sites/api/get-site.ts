import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { SiteDetail } from '../../../types/api.ts';

export function getSite(siteId: string): Promise<SiteDetail> {
  return api<SiteDetail>(`/sites/${encodeURIComponent(siteId)}`);
}

export const siteQueryOptions = (siteId: string) =>
  queryOptions({ queryKey: ['sites', 'detail', siteId], queryFn: () => getSite(siteId) });

export function useSite(siteId: string) {
  return useSuspenseQuery(siteQueryOptions(siteId));
}

