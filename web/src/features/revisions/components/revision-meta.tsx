import { CountCell, StateBadge } from '../../../components/badges.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import type { RevisionDetail } from '../../../types/api.ts';

export function RevisionMeta({ revision }: { revision: RevisionDetail }) {
  return (
    <dl className="grid grid-cols-2 gap-x-6 gap-y-2 text-body sm:grid-cols-4">
      <div><dt className="text-caption text-ink-600">State</dt><dd><StateBadge state={revision.state} /></dd></div>
      <div><dt className="text-caption text-ink-600">Pushed by</dt><dd className="font-medium">{revision.author?.name ?? '—'}</dd><dd className="text-caption text-ink-600">{formatDateTime(revision.createdAt)}</dd></div>
      <div><dt className="text-caption text-ink-600">Findings</dt><dd className="flex flex-wrap gap-1"><CountCell severity="error" count={revision.errorCount} /> <CountCell severity="warning" count={revision.warningCount} /> <CountCell severity="info" count={revision.infoCount} /></dd></div>
      <div><dt className="text-caption text-ink-600">SHA-256</dt><dd className="truncate font-mono text-caption" title={revision.sha256}>{revision.sha256?.slice(0, 16)}…</dd></div>
      {revision.message && <div className="col-span-2 sm:col-span-4"><dt className="text-caption text-ink-600">Message</dt><dd className="break-words">“{revision.message}”</dd></div>}
    </dl>
  );
}
