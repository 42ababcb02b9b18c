import type { SiteChange } from '../../../../../shared/site/diff-sites.ts';
import { formatValue } from '../../../lib/format.ts';

const KIND_LABEL: Record<SiteChange['kind'], string> = { added: '+ added', removed: '− removed', changed: '~ changed' };
const KIND_STYLE: Record<SiteChange['kind'], string> = {
  added: 'text-weir-800',
  removed: 'text-sev-error',
  changed: 'text-ink-800',
};

export function DiffTable({ changes, against }: { changes: readonly SiteChange[]; against: string }) {
  if (changes.length === 0) return <p className="text-body text-ink-600">No field differs from {against}.</p>;
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[560px] border-collapse text-body">
        <caption className="mb-2 text-left text-caption text-ink-700">{changes.length} field{changes.length === 1 ? '' : 's'} differ from {against}</caption>
        <thead className="border-b border-ink-200 text-caption text-ink-700">
          <tr>
            <th scope="col" className="py-1.5 pr-3 text-left font-medium">Field</th>
            <th scope="col" className="py-1.5 pr-3 text-left font-medium">Change</th>
            <th scope="col" className="py-1.5 pr-3 text-left font-medium">Before</th>
            <th scope="col" className="py-1.5 text-left font-medium">After</th>
          </tr>
        </thead>
        <tbody>
          {changes.map((c) => (
            <tr key={`${c.path}-${c.kind}`} className="border-b border-ink-100 align-top last:border-0" data-change={c.kind}>
              <th scope="row" className="py-1.5 pr-3 text-left font-mono text-caption font-medium text-ink-950 break-all">{c.path}</th>
              <td className={`whitespace-nowrap py-1.5 pr-3 text-caption font-semibold ${KIND_STYLE[c.kind]}`}>{KIND_LABEL[c.kind]}</td>
              <td className="py-1.5 pr-3 font-mono text-caption break-all">
                {c.kind === 'added' ? <span className="text-ink-500">—</span> : <del className="bg-sev-error-bg text-sev-error decoration-sev-error/50">{formatValue(c.before)}</del>}
              </td>
              <td className="py-1.5 font-mono text-caption break-all">
                {c.kind === 'removed' ? <span className="text-ink-500">—</span> : <ins className="bg-weir-50 text-weir-800 no-underline">{formatValue(c.after)}</ins>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
