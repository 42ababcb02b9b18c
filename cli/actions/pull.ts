// `weir pull <site-id>`: the approved (or --latest) revision's site file, to a file or stdout.
import { existsSync, readFileSync } from 'node:fs';
import { createColour } from '../lib/colour.ts';
import { CliError, EXIT_FINDINGS } from '../lib/errors.ts';
import { checkSiteIdArgument, fetchSite, revisionText } from '../lib/remote-site.ts';
import { openSession } from '../lib/session.ts';
import { writeFileAtomic } from '../lib/write-atomic.ts';

export async function runPull(siteId: string, options: { output?: string; latest?: boolean; force?: boolean; server?: string; color?: boolean }): Promise<void> {
  checkSiteIdArgument(siteId);
  const session = openSession(options);
  const answer = await fetchSite(session.client, siteId);
  if (!answer) throw new CliError(`there is no site ${siteId} on ${session.server}`);
  const revision = options.latest ? answer.latest : answer.approved;
  if (!revision) {
    throw new CliError(options.latest ? `site ${siteId} has no revision` : `site ${siteId} has no approved revision yet`, EXIT_FINDINGS, options.latest ? undefined : 'give --latest for its latest revision, whatever its state');
  }
  const text = await revisionText(session.client, revision);
  const target = options.output ?? `${siteId}.yaml`;
  if (target === '-') {
    process.stdout.write(text);
    return;
  }
  const c = createColour(process.stdout, options);
  const described = `site ${siteId} revision #${revision.number} (${revision.state})`;
  if (existsSync(target)) {
    let current: string | null = null;
    try { current = readFileSync(target, 'utf8'); } catch { /* unreadable: treated as different */ }
    if (current === text) {
      process.stdout.write(`${target} is already ${described}.\n`);
      return;
    }
    if (!options.force) throw new CliError(`${target} exists and differs from ${described}`, 2, 'give --force to overwrite it, or -o another file');
  }
  writeFileAtomic(target, text);
  process.stdout.write(`${c.green('Wrote')} ${c.bold(target)}: ${described}.\n`);
}
