import type { SiteChange } from '../../../../../shared/site/diff-sites.ts';
import { formatValue } from '../../../lib/format.ts';

const KIND_LABEL: Record<SiteChange['kind'], string> = { added: '+ added', removed: '− removed', changed: '~ changed' };
const KIND_STYLE: Record<SiteChange['kind'], string> = {
  added: 'text-weir-800',
  removed: 'text-sev-error',
  changed: 'text-ink-800',
};

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

function leaves(value: unknown, path: string, out: [string, unknown][]): void {
  if (isPlainObject(value) && Object.keys(value).length > 0) {
    for (const [k, v] of Object.entries(value)) leaves(v, `${path}.${k}`, out);
  } else if (Array.isArray(value) && value.length > 0 && value.some((v) => typeof v === 'object' && v !== null)) {
    value.forEach((v, i) => {
      const id = isPlainObject(v) && typeof v.id === 'string' ? v.id : String(i);
      leaves(v, `${path}[${id}]`, out);
    });
  } else {
    out.push([path, value]);
  }
}

/** A whole section added or removed is shown field by field, as a reviewer reads it. */
export function flattenChanges(changes: readonly SiteChange[]): SiteChange[] {
  const out: SiteChange[] = [];
  for (const c of changes) {
    if (c.kind === 'changed') {
      out.push(c);
      continue;
    }
    const fields: [string, unknown][] = [];
    leaves(c.kind === 'added' ? c.after : c.before, c.path, fields);
    for (const [path, value] of fields) out.push(c.kind === 'added' ? { path, kind: 'added', before: null, after: value } : { path, kind: 'removed', before: value, after: null });
  }
  return out;
}

export function DiffTable({ changes: raw, against, collapse = false }: { changes: readonly SiteChange[]; against: string; collapse?: boolean }) {
  if (raw.length === 0) return <p className="text-body text-ink-600">No field differs from {against}.</p>;
  const changes = flattenChanges(raw);
  const table = (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[520px] table-fixed border-collapse text-body">
        <colgroup><col className="w-[40%]" /><col className="w-[7rem]" /><col /><col /></colgroup>
        <caption className="mb-2 text-left text-caption text-ink-700">{changes.length === 1 ? '1 field differs' : `${changes.length} fields differ`} from {against}</caption>
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
            <tr key={`${c.path}-${c.kind}`} data-path={c.path} className="border-b border-ink-100 align-top last:border-0" data-change={c.kind}>
              <th scope="row" className="py-1.5 pr-3 text-left font-mono text-caption font-medium text-ink-950 [overflow-wrap:anywhere]">{c.path}</th>
              <td className={`whitespace-nowrap py-1.5 pr-3 text-caption font-semibold ${KIND_STYLE[c.kind]}`}>{KIND_LABEL[c.kind]}</td>
              <td className="py-1.5 pr-3 font-mono text-caption [overflow-wrap:anywhere]">
                {c.kind === 'added' ? <span className="text-ink-500">—</span> : <del className="bg-sev-error-bg text-sev-error decoration-sev-error/50">{formatValue(c.before)}</del>}
              </td>
              <td className="py-1.5 font-mono text-caption [overflow-wrap:anywhere]">
                {c.kind === 'removed' ? <span className="text-ink-500">—</span> : <ins className="bg-weir-50 text-weir-800 no-underline">{formatValue(c.after)}</ins>}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
  if (!collapse) return table;
  return (
    <details className="rounded-md border border-ink-200 px-3 py-2">
      <summary className="cursor-pointer text-body font-medium">Every field is new: show all {changes.length}</summary>
      <div className="mt-2">{table}</div>
    </details>
  );
}
