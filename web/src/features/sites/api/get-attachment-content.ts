import { queryOptions, useQuery } from '@tanstack/react-query';
import { apiBlob } from '../../../lib/api-client.ts';

/** The file itself, fetched with the token (an `<img src>` cannot send it). */
export function getAttachmentContent(id: string | number, signal?: AbortSignal): Promise<Blob> {
  return apiBlob(`/attachments/${encodeURIComponent(String(id))}/content`, { signal });
}

export const attachmentContentQueryOptions = (id: string | number) =>
  queryOptions({
    queryKey: ['attachments', 'content', String(id)],
    queryFn: ({ signal }) => getAttachmentContent(id, signal),
    staleTime: Infinity,
    gcTime: 5 * 60_000,
  });

export function useAttachmentContent(id: string | number, enabled = true) {
  return useQuery({ ...attachmentContentQueryOptions(id), enabled });
}
