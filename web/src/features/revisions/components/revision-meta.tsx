import { SeverityBadge, StateBadge } from '../../../components/badges.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import type { RevisionDetail } from '../../../types/api.ts';

export function RevisionMeta({ revision }: { revision: RevisionDetail }) {
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-body sm:grid-cols-4">
      <div><dt className="text-caption text-ink-600">State</dt><dd><StateBadge state={revision.state} /></dd></div>
      <div><dt className="text-caption text-ink-600">Pushed by</dt><dd className="font-medium">{revision.author?.name ?? '—'}</dd><dd className="text-caption text-ink-600">{formatDateTime(revision.createdAt)}</dd></div>
      <div><dt className="text-caption text-ink-600">Findings</dt><dd className="flex flex-wrap gap-1">
        {revision.errorCount + revision.warningCount + revision.infoCount === 0
          ? <span className="text-ink-700">None</span>
          : (['error', 'warning', 'info'] as const).map((s) => {
              const n = s === 'error' ? revision.errorCount : s === 'warning' ? revision.warningCount : revision.infoCount;
              return n > 0 ? <SeverityBadge key={s} severity={s} count={n} /> : null;
            })}
      </dd></div>
      <div><dt className="text-caption text-ink-600">SHA-256</dt><dd className="truncate font-mono text-caption" title={revision.sha256}>{revision.sha256?.slice(0, 16)}…</dd></div>
      {revision.message && <div className="col-span-2 sm:col-span-4"><dt className="text-caption text-ink-600">Message</dt><dd className="break-words">“{revision.message}”</dd></div>}
    </dl>
  );
}
