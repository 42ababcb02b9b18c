// Findings grouped by severity. Each names its rule, message, hint and source, and links to its
// line in the YAML view beside it.
import { SEVERITY_LABEL, SeverityIcon } from '../../../components/badges.tsx';
import type { Finding, Severity } from '../../../../../shared/site/types.ts';

const ORDER: Severity[] = ['error', 'warning', 'info'];
const GROUP_STYLE: Record<Severity, string> = {
  error: 'border-sev-error/40 text-sev-error',
  warning: 'border-sev-warning-line/70 text-sev-warning',
  info: 'border-sev-info/30 text-sev-info',
};

export function lineAnchor(line: number): string {
  return `yaml-line-${line}`;
}

export interface FindingsListProps {
  findings: readonly Finding[];
  /** Called when a finding's line link is followed, so the YAML view can highlight it. */
  onSelectLine?: (line: number) => void;
  selectedLine?: number | null;
}

export function FindingsList({ findings, onSelectLine, selectedLine }: FindingsListProps) {
  if (findings.length === 0) {
    return <p className="rounded-md border border-weir-600/40 bg-weir-50 px-3 py-2 text-body text-weir-800">No findings: every rule passed.</p>;
  }
  return (
    <div className="flex flex-col gap-4">
      {ORDER.map((severity) => {
        const group = findings.filter((f) => f.severity === severity).slice().sort((a, b) => a.line - b.line || a.column - b.column);
        if (group.length === 0) return null;
        const headingId = `findings-${severity}`;
        return (
          <section key={severity} aria-labelledby={headingId} data-severity-group={severity}>
            <h3 id={headingId} className={`mb-2 flex items-center gap-2 border-b pb-1 text-lead font-semibold ${GROUP_STYLE[severity]}`}>
              <SeverityIcon severity={severity} />
              {SEVERITY_LABEL[severity]}s <span className="text-body font-normal text-ink-700">({group.length})</span>
            </h3>
            <ul className="flex flex-col gap-2">
              {group.map((f, i) => (
                <li
                  key={`${f.ruleId}-${f.path}-${f.line}-${i}`}
                  className={`rounded-md border bg-white px-3 py-2 ${selectedLine === f.line ? 'border-weir-600 ring-2 ring-weir-500/40' : 'border-ink-200'}`}
                >
                  <div className="flex flex-wrap items-baseline justify-between gap-x-3 gap-y-1">
                    <span className="inline-flex items-center gap-1.5">
                      <span className={GROUP_STYLE[severity].split(' ').slice(1).join(' ')}><SeverityIcon severity={severity} className="size-3.5" /></span>
                      <span className="sr-only">{SEVERITY_LABEL[severity]}:</span>
                      <code className="rounded bg-ink-100 px-1.5 py-0.5 font-mono text-caption text-ink-900">{f.ruleId}</code>
                    </span>
                    <a
                      href={`#${lineAnchor(f.line)}`}
                      className="font-mono text-caption font-medium text-weir-700 underline underline-offset-2"
                      onClick={() => onSelectLine?.(f.line)}
                      aria-label={`Line ${f.line}, column ${f.column}${f.path ? `, at ${f.path}` : ''}: show in the site file`}
                    >
                      line {f.line}:{f.column}
                    </a>
                  </div>
                  <p className="mt-1 text-body text-ink-950 break-words">{f.message}</p>
                  {f.hint && <p className="mt-0.5 text-body text-ink-700 break-words"><span className="font-medium">Hint:</span> {f.hint}</p>}
                  <p className="mt-0.5 text-caption text-ink-600 break-words">
                    {f.path && <><span className="font-mono">{f.path}</span>{f.source ? ' · ' : ''}</>}
                    {f.source && <span>Source: {f.source}</span>}
                  </p>
                </li>
              ))}
            </ul>
          </section>
        );
      })}
    </div>
  );
}
