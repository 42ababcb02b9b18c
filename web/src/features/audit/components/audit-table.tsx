import { Link } from 'react-router-dom';
import { formatDateTime, formatValue } from '../../../lib/format.ts';
import type { AuditEvent } from '../../../types/api.ts';

function detailText(event: AuditEvent): string {
  const detail = event.details;
  if (detail === undefined || detail === null) return '';
  if (typeof detail === 'string') return detail;
  if (typeof detail === 'object') {
    return Object.entries(detail as Record<string, unknown>)
      .filter(([, v]) => v !== null && v !== undefined && v !== '')
      .map(([k, v]) => `${k}: ${formatValue(v)}`)
      .join(' · ');
  }
  return formatValue(detail);
}

/** Revisions are numbered per site; the event's details carry that number. */
function revisionNumber(event: AuditEvent): number | null {
  const d = event.details;
  return d && typeof d === 'object' && typeof (d as { number?: unknown }).number === 'number' ? (d as { number: number }).number : null;
}

export function AuditTable({ items, busy }: { items: AuditEvent[]; busy?: boolean }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
      <table className="w-full min-w-[760px] border-collapse text-body" aria-busy={busy || undefined}>
        <caption className="sr-only">Change log events, newest first</caption>
        <thead className="border-b border-ink-200 bg-ink-50 text-caption text-ink-700">
          <tr>
            <th scope="col" className="px-3 py-2 text-left font-medium">#</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">When</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Action</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Site</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Who</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Detail</th>
          </tr>
        </thead>
        <tbody>
          {items.length === 0 && (
            <tr><td colSpan={6} className="px-3 py-8 text-center text-ink-600">No events match these filters.</td></tr>
          )}
          {items.map((e) => (
            <tr key={e.seq} className="border-b border-ink-100 align-top last:border-0" data-action={e.action} data-revision={e.revisionId ?? undefined}>
              <td className="px-3 py-2 font-mono text-caption text-ink-600">{e.seq}</td>
              <td className="whitespace-nowrap px-3 py-2">{formatDateTime(e.at)}</td>
              <td className="px-3 py-2"><code className="rounded bg-ink-100 px-1.5 py-0.5 font-mono text-caption text-ink-900">{e.action}</code></td>
              <td className="px-3 py-2">
                {e.siteId ? <Link to={`/sites/${encodeURIComponent(e.siteId)}`} className="whitespace-nowrap font-mono text-caption underline decoration-ink-300 underline-offset-2">{e.siteId}</Link> : '—'}
                {e.revisionId ? <div><Link to={`/revisions/${e.revisionId}`} className="text-caption text-weir-700 underline underline-offset-2">revision {revisionNumber(e) ?? `#${e.revisionId}`}</Link></div> : null}
              </td>
              <td className="px-3 py-2">
                {e.actor?.name && <div>{e.actor.name}</div>}
                <div className={e.actor?.name ? 'text-caption text-ink-600' : ''}>{e.actor?.email ?? '—'}</div>
              </td>
              <td className="px-3 py-2 text-caption text-ink-800 break-words">{detailText(e)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
