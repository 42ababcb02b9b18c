// The figures every bench reports, and the table `npm run bench` prints at the end.
import Table from 'cli-table3';

export type Result = 'PASS' | 'OVER' | 'INFO' | 'SKIP';

export interface Figure {
  bench: string;
  figure: string;
  value: string;
  /** The baseline measured in the same run, when the figure is compared with one. */
  baseline?: string;
  ratio?: string;
  budget?: string;
  result: Result;
  note?: string;
}

/** PASS when `value` is at most `limit` (a time, a ratio, a size), else OVER. */
export const atMost = (value: number, limit: number): Result => (Number.isFinite(value) && value <= limit ? 'PASS' : 'OVER');
/** PASS when `value` is at least `limit` (a throughput), else OVER. */
export const atLeast = (value: number, limit: number): Result => (Number.isFinite(value) && value >= limit ? 'PASS' : 'OVER');

export function skipped(bench: string, figure: string, why: string, budget?: string): Figure {
  return { bench, figure, value: '—', budget, result: 'SKIP', note: why };
}

export function renderTable(figures: readonly Figure[]): string {
  const table = new Table({
    head: ['bench', 'figure', 'value', 'baseline', 'ratio', 'budget', 'result'],
    style: { head: [], border: [] },
    wordWrap: true,
    colWidths: [14, 44, 16, 16, 9, 18, 8],
  });
  for (const f of figures) table.push([f.bench, f.figure, f.value, f.baseline ?? '', f.ratio ?? '', f.budget ?? '', f.result]);
  const notes = figures.filter((f) => f.note).map((f) => `- ${f.bench} / ${f.figure}: ${f.note}`);
  return table.toString() + (notes.length ? `\n${notes.join('\n')}` : '');
}

/** The same table as Markdown, for the README's Performance section. */
export function renderMarkdown(figures: readonly Figure[]): string {
  const esc = (s: string) => s.replace(/\|/g, '\\|');
  const rows = figures.map((f) => `| ${[f.bench, f.figure, f.value, f.baseline ?? '', f.ratio ?? '', f.budget ?? '', f.result].map(esc).join(' | ')} |`);
  return ['| bench | figure | value | baseline | ratio | budget | result |', '|---|---|---|---|---|---|---|', ...rows].join('\n');
}
