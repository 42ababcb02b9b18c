import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Attachment } from '../../../types/api.ts';

export interface UploadInput {
  siteId: string;
  file: File;
  caption: string;
}

export function uploadAttachment({ siteId, file, caption }: UploadInput): Promise<{ attachment: Attachment }> {
  const form = new FormData();
  form.set('caption', caption);
  form.set('file', file, file.name);
  return api<{ attachment: Attachment }>(`/sites/${encodeURIComponent(siteId)}/attachments`, { method: 'POST', body: form });
}

export function useUploadAttachment() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: uploadAttachment,
    onSuccess: (_data, { siteId }) => qc.invalidateQueries({ queryKey: ['sites', 'attachments', siteId] }),
  });
}
