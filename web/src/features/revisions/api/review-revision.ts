import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { Review, Revision } from '../../../types/api.ts';

export interface ReviewInput {
  revisionId: string | number;
  decision: 'approve' | 'return';
  comment: string;
}

export function reviewRevision({ revisionId, decision, comment }: ReviewInput): Promise<{ revision: Revision; review: Review }> {
  return api(`/revisions/${encodeURIComponent(String(revisionId))}/review`, { method: 'POST', json: { decision, comment } });
}

export function useReviewRevision() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: reviewRevision,
    // A decision changes the site list, the site, every revision of it and the change log.
    onSuccess: () => Promise.all([
      qc.invalidateQueries({ queryKey: ['sites'] }),
      qc.invalidateQueries({ queryKey: ['revisions'] }),
      qc.invalidateQueries({ queryKey: ['audit'] }),
    ]),
  });
}
