import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/button.tsx';
import { InlineError } from '../../../components/feedback.tsx';
import { TextAreaField } from '../../../components/field.tsx';
import type { ApprovalBlocker, RevisionDetail } from '../../../types/api.ts';
import { useReviewRevision } from '../api/review-revision.ts';

/** Short, on the button; long, under it. */
export const BLOCKER_TEXT: Record<ApprovalBlocker, { short: string; long: string }> = {
  'not-a-lead': { short: 'leads only', long: 'Only lead engineers approve or return revisions.' },
  'own-revision': { short: 'your own revision', long: 'You pushed this revision yourself. Another lead engineer must review it (four-eyes).' },
  'has-errors': { short: 'it has error findings', long: 'This revision has error findings. It cannot be approved until a revision without errors is pushed; you can return it.' },
  'not-pending': { short: 'no longer pending', long: 'This revision is no longer pending: it has already been decided or superseded.' },
  'stale-parent': { short: 'based on an older approval', long: 'This revision was made from an approval that is no longer in force. Ask for a revision based on the approved one.' },
};

// Returning is refused for these as well; error findings and a stale base are reasons to return.
const BLOCKS_RETURN: readonly ApprovalBlocker[] = ['not-a-lead', 'own-revision', 'not-pending'];

export function ReviewForm({ revision }: { revision: RevisionDetail }) {
  const review = useReviewRevision();
  const [comment, setComment] = useState('');
  const [commentError, setCommentError] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const blockers = revision.approvalBlockers ?? [];
  const canApprove = blockers.length === 0;
  const canReturn = !blockers.some((b) => BLOCKS_RETURN.includes(b));
  // Once decided or superseded there is nothing to write: only say why.
  const decided = blockers.includes('not-pending') && !done;

  const decide = (decision: 'approve' | 'return') => (event?: FormEvent) => {
    event?.preventDefault();
    setDone(null);
    if (decision === 'return' && !comment.trim()) {
      setCommentError('Write what the author must change: a comment is required to return a revision.');
      return;
    }
    setCommentError(null);
    review.mutate(
      { revisionId: revision.id, decision, comment: comment.trim() },
      {
        onSuccess: () => {
          setDone(decision === 'approve' ? `Revision ${revision.number} approved.` : `Revision ${revision.number} returned to ${revision.author?.name ?? 'its author'}.`);
          setComment('');
        },
      },
    );
  };

  return (
    <form onSubmit={decide('approve')} className="flex flex-col gap-3" aria-label="Review this revision" noValidate>
      {!decided && <TextAreaField
        label="Comment"
        name="comment"
        hint="Required to return; optional to approve. The author sees it by e-mail and in the history."
        value={comment}
        onChange={(e) => setComment(e.target.value)}
        error={commentError}
        maxLength={4000}
        disabled={!canReturn && !canApprove}
      />}
      <div className="flex flex-wrap items-start gap-3">
        <div className="flex flex-col gap-1">
          <Button type="submit" disabled={!canApprove || review.isPending} aria-describedby={canApprove ? undefined : 'approve-blocked'}>
            {canApprove ? '✓ Approve' : `Cannot approve: ${blockers.map((b) => BLOCKER_TEXT[b]?.short ?? b).join(', ')}`}
          </Button>
        </div>
        {!decided && (
          <Button variant="danger" disabled={!canReturn || review.isPending} onClick={() => decide('return')()}>
            ↩ Return to author
          </Button>
        )}
      </div>
      {!canApprove && (
        <ul id="approve-blocked" className="list-disc space-y-0.5 pl-5 text-body text-ink-800" data-testid="approval-blockers">
          {blockers.map((b) => <li key={b} data-blocker={b}>{BLOCKER_TEXT[b]?.long ?? b}</li>)}
        </ul>
      )}
      <div aria-live="polite">
        {review.isError && <InlineError error={review.error} title="Not recorded:" />}
        {done && <p className="rounded-md border border-weir-600/50 bg-weir-50 px-3 py-2 text-body font-medium text-weir-800" role="status">{done}</p>}
      </div>
    </form>
  );
}
