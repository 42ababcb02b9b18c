// Findings as people and editors read them: `file:line:col: severity rule-id message`
// (the compiler convention), each followed by its hint where the rule has one.
import type { Finding, Severity } from '../../shared/index.ts';
import type { Colour } from './colour.ts';

export function severityText(severity: Severity, c: Colour): string {
  if (severity === 'error') return c.red.bold('error');
  if (severity === 'warning') return c.yellow.bold('warning');
  return c.blue('info');
}

export function findingLines(file: string, finding: Finding, c: Colour): string[] {
  const at = `${file}:${finding.line}:${finding.column}:`;
  const lines = [`${c.bold(at)} ${severityText(finding.severity, c)} ${c.dim(finding.ruleId)} ${finding.message}`];
  if (finding.hint) lines.push(`    ${c.cyan('hint:')} ${finding.hint}`);
  return lines;
}

/** The findings of one file, one block; empty when there are none. */
export function fileBlock(file: string, findings: readonly Finding[], c: Colour): string {
  return findings.flatMap((f) => findingLines(file, f, c)).join('\n');
}

export function plural(n: number, one: string, many = `${one}s`): string {
  return `${n} ${n === 1 ? one : many}`;
}

export interface Totals {
  files: number;
  errors: number;
  warnings: number;
  infos: number;
}

export function summaryLine(t: Totals & { filesWithFindings: number }, c: Colour): string {
  const checked = `${plural(t.files, 'file')} checked`;
  if (t.errors + t.warnings + t.infos === 0) return `${checked}: ${c.green('no findings')}`;
  const parts = [
    t.errors ? c.red.bold(plural(t.errors, 'error')) : '0 errors',
    t.warnings ? c.yellow(plural(t.warnings, 'warning')) : '0 warnings',
    t.infos ? c.blue(plural(t.infos, 'info')) : '0 infos',
  ];
  return `${checked}: ${parts.join(', ')} in ${plural(t.filesWithFindings, 'file')}`;
}
