import { Link } from 'react-router-dom';
import { CountCell, StateBadge } from '../../../components/badges.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import type { Revision } from '../../../types/api.ts';

export function RevisionHistory({ revisions, approvedId }: { revisions: Revision[]; approvedId: Revision['id'] | null }) {
  if (revisions.length === 0) return <p className="text-body text-ink-600">No revisions yet.</p>;
  return (
    <ol className="relative flex flex-col gap-3 border-l-2 border-ink-200 pl-5" aria-label="Revisions, newest first">
      {revisions.map((r) => (
        <li key={r.id} className="relative">
          <span className={`absolute -left-[27px] top-1.5 size-3 rounded-full border-2 border-white ${r.state === 'approved' ? 'bg-weir-600' : r.state === 'returned' ? 'bg-sev-warning-line' : r.state === 'pending' ? 'bg-ink-900' : 'bg-ink-300'}`} aria-hidden="true" />
          <div className="flex flex-wrap items-center gap-2">
            <Link to={`/revisions/${r.id}`} className="font-semibold text-ink-950 underline decoration-ink-300 underline-offset-2 hover:decoration-weir-600">
              Revision {r.number}
            </Link>
            <StateBadge state={r.state} />
            {String(r.id) === String(approvedId) && <span className="text-caption font-medium text-weir-800">in force</span>}
            <CountCell severity="error" count={r.errorCount} />
            <CountCell severity="warning" count={r.warningCount} />
          </div>
          <p className="text-caption text-ink-700">
            pushed by {r.author?.name ?? 'unknown'} · {formatDateTime(r.createdAt)}
          </p>
          {r.message && <p className="mt-0.5 text-body text-ink-900 break-words">“{r.message}”</p>}
          {(r.reviews ?? []).length > 0 && (
            <ul className="mt-1.5 flex flex-col gap-1.5">
              {(r.reviews ?? []).map((review) => (
                <li key={review.id} className="rounded-md bg-ink-50 px-3 py-2 text-body">
                  <span className={`font-semibold ${review.decision === 'approve' ? 'text-weir-800' : 'text-sev-warning'}`}>
                    {review.decision === 'approve' ? '✓ Approved' : '↩ Returned'}
                  </span>{' '}
                  <span className="text-caption text-ink-700">by {review.reviewer?.name ?? 'unknown'} · {formatDateTime(review.createdAt)}</span>
                  {review.comment && <p className="mt-0.5 text-ink-900 break-words whitespace-pre-line">{review.comment}</p>}
                </li>
              ))}
            </ul>
          )}
        </li>
      ))}
    </ol>
  );
}
