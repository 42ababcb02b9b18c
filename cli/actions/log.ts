// `weir log <site-id>`: the site's revisions and their reviews, newest first.
import type { Revision, Review } from '../lib/api-types.ts';
import { createColour, type Colour } from '../lib/colour.ts';
import { ApiError, CliError } from '../lib/errors.ts';
import { plural } from '../lib/print-findings.ts';
import { checkSiteIdArgument, when } from '../lib/remote-site.ts';
import { openSession } from '../lib/session.ts';

const stateText = (state: string, c: Colour) => {
  const padded = state.padEnd(10);
  return state === 'approved' ? c.green(padded) : state === 'returned' ? c.red(padded) : state === 'pending' ? c.yellow(padded) : c.dim(padded);
};

function reviewLine(r: Review, c: Colour): string {
  const mark = r.decision === 'approve' ? c.green('✓ approved') : c.red('↩ returned');
  const who = r.reviewer ? `${r.reviewer.name} <${r.reviewer.email}>` : 'a former user';
  return `    ${mark} by ${who}, ${when(r.createdAt)}${r.comment ? `: ${JSON.stringify(r.comment)}` : ''}`;
}

export async function runLog(siteId: string, options: { server?: string; format?: string; color?: boolean }): Promise<void> {
  checkSiteIdArgument(siteId);
  const session = openSession(options);
  let items: (Revision & { reviews?: Review[] })[];
  try {
    ({ items } = await session.client.get<{ items: (Revision & { reviews?: Review[] })[] }>(`/api/sites/${encodeURIComponent(siteId)}/revisions`));
  } catch (err) {
    if (err instanceof ApiError && err.status === 404) throw new CliError(`there is no site ${siteId} on ${session.server}`);
    throw err;
  }
  if (options.format === 'json') {
    process.stdout.write(`${JSON.stringify({ site: siteId, items }, null, 2)}\n`);
    return;
  }
  const c = createColour(process.stdout, options);
  const lines: string[] = [`${c.bold(siteId)} on ${session.server}: ${plural(items.length, 'revision')}, newest first`];
  for (const r of items) {
    const author = r.author ? `${r.author.name} <${r.author.email}>` : 'a former user';
    lines.push('');
    lines.push(`${c.bold(`#${r.number}`.padEnd(5))} ${stateText(r.state, c)} ${when(r.createdAt)}  ${author}`);
    if (r.message) lines.push(`    ${JSON.stringify(r.message)}`);
    const counts = `${plural(r.errorCount, 'error')}, ${plural(r.warningCount, 'warning')}, ${plural(r.infoCount, 'info')}`;
    lines.push(`    ${r.errorCount ? c.red(counts) : counts} ${c.dim(`· sha256 ${r.sha256.slice(0, 12)}`)}`);
    // Reviews of one revision, newest first like the revisions.
    for (const review of [...(r.reviews ?? [])].reverse()) lines.push(reviewLine(review, c));
  }
  process.stdout.write(`${lines.join('\n')}\n`);
}
