import { queryOptions, useSuspenseQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { RevisionDetail } from '../../../types/api.ts';

export function getRevision(id: string): Promise<{ revision: RevisionDetail }> {
  return api<{ revision: RevisionDetail }>(`/revisions/${encodeURIComponent(id)}`);
}

export const revisionQueryOptions = (id: string | number) =>
  queryOptions({ queryKey: ['revisions', 'detail', String(id)], queryFn: () => getRevision(String(id)) });

export function useRevision(id: string | number) {
  return useSuspenseQuery(revisionQueryOptions(id));
}
