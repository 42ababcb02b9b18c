import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Revision } from '../../../types/api.ts';

export function getSiteRevisions(siteId: string): Promise<{ items: Revision[] }> {
  return api<{ items: Revision[] }>(`/sites/${encodeURIComponent(siteId)}/revisions`);
}

export const siteRevisionsQueryOptions = (siteId: string) =>
  queryOptions({ queryKey: ['sites', 'revisions', siteId], queryFn: () => getSiteRevisions(siteId) });

export function useSiteRevisions(siteId: string) {
  return useSuspenseQuery(siteRevisionsQueryOptions(siteId));
}
