import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Attachment } from '../../../types/api.ts';

export function getAttachments(siteId: string): Promise<{ items: Attachment[] }> {
  return api<{ items: Attachment[] }>(`/sites/${encodeURIComponent(siteId)}/attachments`);
}

export const attachmentsQueryOptions = (siteId: string) =>
  queryOptions({ queryKey: ['sites', 'attachments', siteId], queryFn: () => getAttachments(siteId) });

export function useAttachments(siteId: string) {
  return useQuery(attachmentsQueryOptions(siteId));
}
