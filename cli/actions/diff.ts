// `weir diff <file>`: the field-level change from the site's approved revision to the local file.
import { stringify } from 'yaml';
import { checkSite, diffSites, type SiteChange } from '../../shared/index.ts';
import { createColour, type Colour } from '../lib/colour.ts';
import { CliError, EXIT_FINDINGS } from '../lib/errors.ts';
import { fileBlock, plural } from '../lib/print-findings.ts';
import { fetchSite, revisionText } from '../lib/remote-site.ts';
import { openSession } from '../lib/session.ts';
import { loadSiteFiles } from '../lib/site-files.ts';
import { siteIdOf } from '../lib/site-id.ts';

/** A value as one short line of YAML flow: `{ id: ct-4, ratedPrimaryA: 100 }`, `"1"`, `5`. */
export function showValue(value: unknown): string {
  if (value === null || value === undefined) return 'null';
  return stringify(value, { collectionStyle: 'flow', lineWidth: 0 }).trim();
}

export function changeLine(change: SiteChange, c: Colour): string {
  if (change.kind === 'added') return c.green(`+ ${change.path}: ${showValue(change.after)}`);
  if (change.kind === 'removed') return c.red(`- ${change.path}: ${showValue(change.before)}`);
  return `${c.yellow('~')} ${change.path}: ${c.red(showValue(change.before))} ${c.dim('→')} ${c.green(showValue(change.after))}`;
}

export async function runDiff(file: string, options: { server?: string; format?: string; color?: boolean; exitCode?: boolean }): Promise<void> {
  const session = openSession(options);
  const files = await loadSiteFiles([file]);
  if (files.length !== 1) throw new CliError(`${file} names ${files.length} files; weir diff compares one file`);
  const local = files[0];
  const c = createColour(process.stdout, options);
  const check = checkSite(local.text);
  if (check.data === null) {
    process.stdout.write(`${fileBlock(local.path, check.findings, c)}\n`);
    throw new CliError(`${local.path} cannot be read as YAML, so there is nothing to compare`, EXIT_FINDINGS);
  }
  const site = siteIdOf(check.data);
  if (!site) throw new CliError(`${local.path} has no site.id, so it belongs to no site on the server`, EXIT_FINDINGS);

  const answer = await fetchSite(session.client, site);
  const approved = answer?.approved ?? null;
  const before = approved ? checkSite(await revisionText(session.client, approved)).data : null;
  const changes = diffSites(before, check.data);

  if (options.format === 'json') {
    process.stdout.write(`${JSON.stringify({ path: local.path, site, onServer: answer !== null, approved: approved ? { id: approved.id, number: approved.number } : null, changes }, null, 2)}\n`);
  } else {
    const against = approved
      ? `approved revision #${approved.number}${approved.author ? ` by ${approved.author.name}` : ''}`
      : answer ? 'nothing (no revision is approved yet)' : `nothing (site ${site} is not on ${session.server} yet)`;
    const lines = [`${c.bold(local.path)} (site ${site}) against ${against}`];
    if (changes.length === 0) lines.push(c.green('no changes'));
    else lines.push(...changes.map((ch) => `  ${changeLine(ch, c)}`), plural(changes.length, 'change'));
    process.stdout.write(`${lines.join('\n')}\n`);
  }
  if (options.exitCode && changes.length > 0) process.exitCode = EXIT_FINDINGS;
}
