// The revision's site file with line numbers; lines that findings point at are highlighted,
// and the line a finding link selected is marked more strongly and scrolled into view.
import { useEffect, useMemo, useRef } from 'react';
import type { Finding, Severity } from '../../../../../shared/site/types.ts';
import { lineAnchor } from './findings-list.tsx';

const RANK: Record<Severity, number> = { error: 3, warning: 2, info: 1 };
const LINE_STYLE: Record<Severity, string> = {
  error: 'bg-sev-error-bg',
  warning: 'bg-sev-warning-bg',
  info: 'bg-sev-info-bg',
};
const GUTTER_STYLE: Record<Severity, string> = {
  error: 'border-sev-error text-sev-error',
  warning: 'border-sev-warning-line text-sev-warning',
  info: 'border-sev-info text-sev-info',
};
const MARK: Record<Severity, string> = { error: '✕', warning: '!', info: 'i' };

export function YamlView({ text, findings, selectedLine }: { text: string; findings: readonly Finding[]; selectedLine?: number | null }) {
  const lines = useMemo(() => text.replace(/\r\n/g, '\n').replace(/\n$/, '').split('\n'), [text]);
  const byLine = useMemo(() => {
    const map = new Map<number, Finding[]>();
    for (const f of findings) map.set(f.line, [...(map.get(f.line) ?? []), f]);
    return map;
  }, [findings]);
  const container = useRef<HTMLDivElement>(null);

  useEffect(() => {
    if (!selectedLine) return;
    const row = container.current?.querySelector<HTMLElement>(`#${lineAnchor(selectedLine)}`);
    row?.scrollIntoView?.({ block: 'center' });
    row?.focus({ preventScroll: true });
  }, [selectedLine]);

  return (
    <div ref={container} className="max-h-[70vh] overflow-auto rounded-md border border-ink-200 bg-ink-50 font-mono text-[13px] leading-[1.55]" role="region" aria-label="Site file (YAML)" tabIndex={0}>
      <table className="w-full border-collapse">
        <tbody>
          {lines.map((content, i) => {
            const number = i + 1;
            const here = byLine.get(number) ?? [];
            const worst = here.reduce<Severity | null>((w, f) => (!w || RANK[f.severity] > RANK[w] ? f.severity : w), null);
            const selected = selectedLine === number;
            return (
              <tr
                key={number}
                id={lineAnchor(number)}
                tabIndex={-1}
                data-line={number}
                data-highlight={worst ?? undefined}
                aria-current={selected ? 'location' : undefined}
                className={`${worst ? LINE_STYLE[worst] : ''} ${selected ? 'outline-2 -outline-offset-2 outline-weir-600' : ''} scroll-mt-10`}
              >
                <td className={`w-12 select-none border-r-2 px-2 text-right align-top ${worst ? GUTTER_STYLE[worst] : 'border-ink-200 text-ink-500'}`}>
                  {worst && <span className="sr-only">{here.length} finding{here.length === 1 ? '' : 's'}, </span>}
                  {number}
                </td>
                <td className="w-5 select-none text-center align-top font-bold" aria-hidden="true">
                  {worst ? <span className={GUTTER_STYLE[worst].split(' ')[1]}>{MARK[worst]}</span> : null}
                </td>
                <td className="whitespace-pre-wrap break-all pr-3 align-top text-ink-950">
                  {content || ' '}
                  {worst && (
                    <span className="sr-only"> ({here.map((f) => `${f.severity} ${f.ruleId}`).join('; ')})</span>
                  )}
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </div>
  );
}
