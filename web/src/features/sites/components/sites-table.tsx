import { Link } from 'react-router-dom';
import { CountCell, StateBadge } from '../../../components/badges.tsx';
import { formatDateTime } from '../../../lib/format.ts';
import type { SiteListItem } from '../../../types/api.ts';
import type { SiteSort } from '../api/get-sites.ts';

type SortKey = 'name' | 'updated' | 'errors';

function SortHeader({ label, column, sort, onSort, className = '' }: { label: string; column: SortKey; sort: SiteSort; onSort: (sort: SiteSort) => void; className?: string }) {
  const active = sort === column || sort === `-${column}`;
  const descending = sort === `-${column}`;
  const next: SiteSort = active ? (descending ? column : `-${column}`) : column === 'name' ? column : `-${column}`;
  return (
    <th scope="col" aria-sort={active ? (descending ? 'descending' : 'ascending') : 'none'} className={`px-3 py-2 text-left font-medium ${className}`}>
      <button type="button" onClick={() => onSort(next)} className="inline-flex items-center gap-1 rounded hover:text-ink-950">
        {label}
        <span aria-hidden="true" className={active ? 'text-weir-700' : 'text-ink-400'}>{active ? (descending ? '▼' : '▲') : '↕'}</span>
        <span className="sr-only">{active ? `, sorted ${descending ? 'descending' : 'ascending'}; activate to reverse` : ', activate to sort'}</span>
      </button>
    </th>
  );
}

export function SitesTable({ items, sort, onSort, busy }: { items: SiteListItem[]; sort: SiteSort; onSort: (sort: SiteSort) => void; busy?: boolean }) {
  return (
    <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
      <table className="w-full min-w-[760px] border-collapse text-body" aria-busy={busy || undefined}>
        <caption className="sr-only">Sites, with their review state and findings of the latest revision</caption>
        <thead className="border-b border-ink-200 bg-ink-50 text-caption text-ink-700">
          <tr>
            <SortHeader label="Site" column="name" sort={sort} onSort={onSort} />
            <th scope="col" className="px-3 py-2 text-left font-medium">State</th>
            <th scope="col" className="px-3 py-2 text-left font-medium">Latest</th>
            <SortHeader label="Errors" column="errors" sort={sort} onSort={onSort} />
            <th scope="col" className="px-3 py-2 text-left font-medium">Warnings</th>
            <SortHeader label="Last change" column="updated" sort={sort} onSort={onSort} />
          </tr>
        </thead>
        <tbody>
          {items.length === 0 && (
            <tr>
              <td colSpan={6} className="px-3 py-8 text-center text-ink-600">No sites match these filters.</td>
            </tr>
          )}
          {items.map((site) => (
            <tr key={site.id} className="border-b border-ink-100 last:border-0 hover:bg-weir-50/50">
              <td className="px-3 py-2.5">
                <Link to={`/sites/${encodeURIComponent(site.id)}`} className="font-medium text-ink-950 underline decoration-ink-300 underline-offset-2 hover:decoration-weir-600">
                  {site.name}
                </Link>
                <div className="font-mono text-caption text-ink-600">{site.id}</div>
              </td>
              <td className="px-3 py-2.5"><StateBadge state={site.status} /></td>
              <td className="px-3 py-2.5 text-ink-800">
                {site.latestRevision ? (
                  <Link to={`/revisions/${site.latestRevision.id}`} className="underline decoration-ink-300 underline-offset-2 hover:decoration-weir-600" aria-label={`Revision ${site.latestRevision.number} of ${site.name}`}>
                    r{site.latestRevision.number}
                  </Link>
                ) : '—'}
              </td>
              <td className="px-3 py-2.5"><CountCell severity="error" count={site.errorCount} /></td>
              <td className="px-3 py-2.5"><CountCell severity="warning" count={site.warningCount} /></td>
              <td className="px-3 py-2.5 text-ink-800">
                <div>{formatDateTime(site.updatedAt)}</div>
                <div className="text-caption text-ink-600">{site.updatedBy ? site.updatedBy.name : '—'}</div>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
