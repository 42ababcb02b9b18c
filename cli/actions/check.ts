// `weir check`: every site file through the shared engine, then one report in the chosen format.
import { createColour } from '../lib/colour.ts';
import { EXIT_FINDINGS, EXIT_OK } from '../lib/errors.ts';
import { explainTable } from '../lib/explain.ts';
import { fileBlock, summaryLine } from '../lib/print-findings.ts';
import { toSarif } from '../lib/sarif.ts';
import { checkFiles, type CheckedFile } from '../lib/check-files.ts';
import { resolveSiteFiles } from '../lib/site-files.ts';
import { VERSION } from '../lib/version.ts';

export type CheckFormat = 'human' | 'json' | 'sarif';

export interface CheckOptions {
  format: CheckFormat;
  explain?: boolean;
  /** true with --cache. */
  cache?: boolean;
  color?: boolean;
}

export function countTotals(files: readonly CheckedFile[]) {
  const totals = { files: files.length, errors: 0, warnings: 0, infos: 0 };
  for (const file of files) {
    for (const f of file.findings) {
      if (f.severity === 'error') totals.errors++;
      else if (f.severity === 'warning') totals.warnings++;
      else totals.infos++;
    }
  }
  return totals;
}

export async function runCheck(paths: string[], options: CheckOptions): Promise<void> {
  // Gather first, print once: one write (and one JSON.stringify) for the whole report.
  const checked = await checkFiles(await resolveSiteFiles(paths), { cache: options.cache === true && !options.explain });
  const totals = countTotals(checked);

  let out: string;
  if (options.format === 'json') {
    const report = {
      files: checked.map((f) => ({
        path: f.path,
        site: f.site,
        findings: f.findings,
        ...(options.explain ? { figures: f.summary } : {}),
      })),
      summary: totals,
    };
    out = `${JSON.stringify(report, null, 2)}\n`;
  } else if (options.format === 'sarif') {
    out = `${JSON.stringify(toSarif(checked, VERSION), null, 2)}\n`;
  } else {
    const c = createColour(process.stdout, { color: options.color });
    const blocks: string[] = [];
    for (const f of checked) {
      const parts: string[] = [];
      if (f.findings.length) parts.push(fileBlock(f.path, f.findings, c));
      if (options.explain && f.summary) parts.push(explainTable(`${f.site ?? f.path} (${f.path})`, f.summary, c));
      if (parts.length) blocks.push(parts.join('\n'));
    }
    const filesWithFindings = checked.filter((f) => f.findings.length > 0).length;
    blocks.push(summaryLine({ ...totals, filesWithFindings }, c));
    out = `${blocks.join('\n\n')}\n`;
  }
  process.stdout.write(out);
  process.exitCode = totals.errors > 0 ? EXIT_FINDINGS : EXIT_OK;
}
