// `weir status`: each local file against its site on the server.
import { checkSite } from '../../shared/index.ts';
import type { Revision, SiteAnswer } from '../lib/api-types.ts';
import { createColour, type Colour } from '../lib/colour.ts';
import { mapPool } from '../lib/pool.ts';
import { plural } from '../lib/print-findings.ts';
import { fetchSite } from '../lib/remote-site.ts';
import { openSession } from '../lib/session.ts';
import { loadSiteFiles } from '../lib/site-files.ts';
import { siteIdOf } from '../lib/site-id.ts';
import { makeTable } from '../lib/table.ts';
import { siteTextSha256 } from '../lib/text-hash.ts';

export type LocalState = 'same-as-approved' | 'same-as-latest' | 'differs-from-approved' | 'not-approved-yet' | 'not-on-server' | 'no-site-id';

interface Row {
  path: string;
  site: string | null;
  sha256: string;
  latest: Revision | null;
  approved: Revision | null;
  local: LocalState;
}

function localState(sha: string, answer: SiteAnswer | null): LocalState {
  if (!answer) return 'not-on-server';
  if (answer.approved?.sha256 === sha) return 'same-as-approved';
  if (answer.latest?.sha256 === sha) return 'same-as-latest';
  return answer.approved ? 'differs-from-approved' : 'not-approved-yet';
}

function describeLocal(row: Row, c: Colour): string {
  switch (row.local) {
    case 'same-as-approved': return c.green('approved');
    case 'same-as-latest': return `pushed, ${row.latest!.state}`;
    case 'differs-from-approved': return c.yellow(`changed since #${row.approved!.number}`);
    case 'not-approved-yet': return c.yellow('changed, none approved');
    case 'not-on-server': return c.dim('new site');
    case 'no-site-id': return c.red('no site id');
  }
}

const LOCAL_SUMMARY: Record<LocalState, string> = {
  'same-as-approved': 'approved',
  'same-as-latest': 'pushed and waiting',
  'differs-from-approved': 'changed since approval',
  'not-approved-yet': 'changed, none approved',
  'not-on-server': 'new',
  'no-site-id': 'without a site id',
};

const stateColour = (state: string, c: Colour) => (state === 'approved' ? c.green(state) : state === 'returned' ? c.red(state) : state === 'pending' ? c.yellow(state) : state);

export async function runStatus(paths: string[], options: { server?: string; format?: string; color?: boolean }): Promise<void> {
  const session = openSession(options);
  const files = await loadSiteFiles(paths);
  const rows = (await mapPool(files, 4, async (file): Promise<Row> => {
    const site = siteIdOf(checkSite(file.text).data);
    const sha256 = siteTextSha256(file.text);
    if (!site) return { path: file.path, site, sha256, latest: null, approved: null, local: 'no-site-id' };
    const answer = await fetchSite(session.client, site);
    return { path: file.path, site, sha256, latest: answer?.latest ?? null, approved: answer?.approved ?? null, local: localState(sha256, answer) };
  })) as Row[];

  if (options.format === 'json') {
    const strip = (r: Revision | null) => (r ? { id: r.id, number: r.number, state: r.state, sha256: r.sha256, errorCount: r.errorCount, warningCount: r.warningCount, createdAt: r.createdAt } : null);
    process.stdout.write(`${JSON.stringify({ server: session.server, files: rows.map((r) => ({ path: r.path, site: r.site, sha256: r.sha256, local: r.local, latest: strip(r.latest), approved: strip(r.approved) })) }, null, 2)}\n`);
    return;
  }
  const c = createColour(process.stdout, options);
  const table = makeTable(['file', 'site', 'latest', 'approved', 'this file'], c);
  for (const r of rows) {
    table.push([
      r.path,
      r.site ?? c.dim('(none)'),
      r.latest ? `#${r.latest.number} ${stateColour(r.latest.state, c)}${r.latest.errorCount ? c.red(` (${plural(r.latest.errorCount, 'error')})`) : ''}` : c.dim('-'),
      r.approved ? `#${r.approved.number}` : c.dim('none'),
      describeLocal(r, c),
    ]);
  }
  process.stdout.write(`${table.toString()}\n`);
  const counts = (Object.keys(LOCAL_SUMMARY) as LocalState[])
    .map((state) => [state, rows.filter((r) => r.local === state).length] as const)
    .filter(([, n]) => n > 0)
    .map(([state, n]) => `${n} ${LOCAL_SUMMARY[state]}`);
  process.stdout.write(`${plural(rows.length, 'file')} against ${session.server}: ${counts.join(', ')}.\n`);
}
