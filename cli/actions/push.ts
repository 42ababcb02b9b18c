// `weir push`: check locally, then send each file to POST /api/revisions, a few at a time.
import { checkSite, type Finding } from '../../shared/index.ts';
import type { Revision } from '../lib/api-types.ts';
import { createColour, type Colour } from '../lib/colour.ts';
import { ApiError, CliError, EXIT_FINDINGS, EXIT_OK, EXIT_USAGE, messageOf } from '../lib/errors.ts';
import { mapPool } from '../lib/pool.ts';
import { fileBlock, plural } from '../lib/print-findings.ts';
import { startProgress } from '../lib/progress.ts';
import { describeApiError } from '../lib/report-error.ts';
import { openSession } from '../lib/session.ts';
import { loadSiteFiles } from '../lib/site-files.ts';
import { siteIdOf } from '../lib/site-id.ts';
import { makeTable } from '../lib/table.ts';

export interface PushOptions {
  message?: string;
  strict?: boolean;
  concurrency?: string;
  format?: 'human' | 'json';
  server?: string;
  color?: boolean;
}

/** Pushes at once: enough to hide latency, few enough not to queue on SQLite's one writer. */
export const DEFAULT_CONCURRENCY = 4;

interface Outcome {
  path: string;
  site: string | null;
  localFindings: Finding[];
  ok: boolean;
  created?: boolean;
  revision?: Revision;
  error?: { status: number | null; code: string; message: string; details?: unknown };
}

const isFinding = (d: unknown): d is Finding =>
  !!d && typeof d === 'object' && typeof (d as Finding).ruleId === 'string' && typeof (d as Finding).line === 'number';

function resultCell(o: Outcome, c: Colour): string {
  if (!o.ok) return c.red(`failed: ${o.error?.message ?? 'not sent'}`);
  return o.created ? c.green('new') : c.dim('unchanged');
}

export async function runPush(paths: string[], options: PushOptions): Promise<void> {
  const session = openSession(options);
  const limit = options.concurrency === undefined ? DEFAULT_CONCURRENCY : Number(options.concurrency);
  if (!Number.isInteger(limit) || limit < 1 || limit > 16) throw new CliError('--concurrency must be a whole number from 1 to 16');
  const message = options.message?.trim() || undefined;
  if (message && message.length > 1000) throw new CliError('the message may be at most 1000 characters long');

  const files = await loadSiteFiles(paths);
  const checked = files.map((file) => {
    const result = checkSite(file.text);
    return { file, site: siteIdOf(result.data), findings: result.findings, errors: result.counts.error };
  });

  // Two files for one site would race each other into two revisions.
  const bySite = new Map<string, string>();
  for (const item of checked) {
    if (!item.site) continue;
    const other = bySite.get(item.site);
    if (other) throw new CliError(`${other} and ${item.file.path} both describe site ${item.site}; push one of them`);
    bySite.set(item.site, item.file.path);
  }

  const c = createColour(process.stdout, options);
  const human = options.format !== 'json';
  const withErrors = checked.filter((x) => x.errors > 0);
  if (options.strict && withErrors.length > 0) {
    if (human) {
      process.stdout.write(`${withErrors.map((x) => fileBlock(x.file.path, x.findings.filter((f) => f.severity === 'error'), c)).join('\n\n')}\n\n`);
      process.stdout.write(`${c.red('Nothing pushed:')} ${plural(withErrors.length, 'file has', 'files have')} errors (--strict).\n`);
    } else {
      process.stdout.write(`${JSON.stringify({ pushed: false, reason: 'strict', files: withErrors.map((x) => ({ path: x.file.path, site: x.site, findings: x.findings })) }, null, 2)}\n`);
    }
    process.exitCode = EXIT_FINDINGS;
    return;
  }

  // A refused sign-in or an unreachable server fails every file alike: stop at the first.
  let stopped: unknown = null;
  const progress = startProgress(checked.length, 'pushing', human);
  const send = async (item: (typeof checked)[number]): Promise<Outcome> => {
    const base = { path: item.file.path, site: item.site, localFindings: item.findings };
    try {
      const headers: Record<string, string> = { 'content-type': 'application/yaml; charset=utf-8' };
      if (message) headers['x-weir-message'] = encodeURIComponent(message);
      const { body } = await session.client.request<{ revision: Revision; created: boolean }>('POST', '/api/revisions', { body: item.file.text, headers });
      return { ...base, ok: true, created: body.created, revision: body.revision };
    } catch (err) {
      if (err instanceof ApiError) {
        if (err.status === 401 || err.status === 403) stopped ??= err;
        return { ...base, ok: false, error: { status: err.status, code: err.code, message: err.status === 422 ? err.message : describeApiError(err), details: err.details } };
      }
      stopped ??= err;
      return { ...base, ok: false, error: { status: null, code: 'unreachable', message: messageOf(err) } };
    } finally {
      progress.tick(item.file.path);
    }
  };
  const sent = await mapPool(checked, limit, send, () => stopped !== null);
  progress.stop();
  const outcomes: Outcome[] = sent.map((o, i) => o ?? {
    path: checked[i].file.path, site: checked[i].site, localFindings: checked[i].findings, ok: false,
    error: { status: null, code: 'not-sent', message: 'not sent' },
  });

  const created = outcomes.filter((o) => o.ok && o.created).length;
  const unchanged = outcomes.filter((o) => o.ok && !o.created).length;
  const failed = outcomes.filter((o) => !o.ok).length;
  process.exitCode = stopped !== null ? EXIT_USAGE : failed > 0 ? EXIT_FINDINGS : EXIT_OK;

  if (!human) {
    const results = outcomes.map((o) => ({
      path: o.path,
      site: o.site,
      ok: o.ok,
      ...(o.ok ? { created: o.created, revision: o.revision } : { error: o.error }),
    }));
    process.stdout.write(`${JSON.stringify({ results, summary: { files: outcomes.length, created, unchanged, failed } }, null, 2)}\n`);
    return;
  }

  // Refused files: the server's findings (pushed files with errors show them in `weir check`).
  const blocks = outcomes
    .filter((o) => !o.ok && Array.isArray(o.error?.details))
    .map((o) => fileBlock(o.path, (o.error!.details as unknown[]).filter(isFinding), c))
    .filter((b) => b !== '');
  if (blocks.length) process.stdout.write(`${blocks.join('\n\n')}\n\n`);

  const table = makeTable(['file', 'site', 'revision', 'state', 'errors/warnings', 'result'], c);
  for (const o of outcomes) {
    const r = o.revision;
    table.push([
      o.path,
      o.site ?? c.dim('(none)'),
      r ? `#${r.number}` : '',
      r ? r.state : '',
      r ? `${r.errorCount ? c.red(String(r.errorCount)) : '0'}/${r.warningCount ? c.yellow(String(r.warningCount)) : '0'}` : '',
      resultCell(o, c),
    ]);
  }
  process.stdout.write(`${table.toString()}\n`);

  const parts = [`${created} new`, `${unchanged} unchanged`];
  if (failed) parts.push(c.red(`${failed} failed`));
  process.stdout.write(`${plural(outcomes.length, 'file')} to ${session.server}: ${parts.join(', ')}.\n`);
  const blocked = outcomes.filter((o) => o.ok && (o.revision?.errorCount ?? 0) > 0).length;
  if (blocked) process.stdout.write(`${c.yellow(`${plural(blocked, 'revision has', 'revisions have')} errors`)}: they cannot be approved until fixed and pushed again (see \`weir check\`).\n`);
  if (stopped !== null) process.stderr.write(`weir: stopped: ${stopped instanceof ApiError ? describeApiError(stopped) : messageOf(stopped)}\n`);
}
