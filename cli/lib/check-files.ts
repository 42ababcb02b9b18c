// Reads and checks many site files. Almost all the time goes into reading YAML, so two things
// keep a large `weir check` quick: files whose text was checked before by the same engine build
// are taken from a cache (check-cache.ts), and past a few thousand new files the checking is split
// between worker threads (one per core, at most 4). Results keep the order of the files.
import { existsSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { checkSite, type Finding, type SiteSummary } from '../../shared/index.ts';
import { openCheckCache, textKey } from './check-cache.ts';
import { readSiteFiles, type SiteFile } from './site-files.ts';
import { siteIdOf } from './site-id.ts';

export interface CheckedFile {
  path: string;
  site: string | null;
  findings: Finding[];
  /** Null when the file did not pass the schema, or when it came from the cache without one. */
  summary: SiteSummary | null;
}

export interface CheckedText {
  site: string | null;
  findings: Finding[];
  summary: SiteSummary | null;
}

/**
 * Below this many files per thread, starting a thread costs more than it saves: on the 2-core
 * development machine one thread was quicker up to about 3,000 files, and two threads 30 %
 * quicker at 10,000 (npm run bench, check; WEIR_CHECK_THREADS sets the count by hand).
 */
const FILES_PER_THREAD = 2500;
const MAX_THREADS = 4;

export function checkText(text: string): CheckedText {
  const result = checkSite(text);
  return { site: siteIdOf(result.data), findings: result.findings, summary: result.summary };
}

function threadCount(files: number): number {
  const fromEnv = Number(process.env.WEIR_CHECK_THREADS);
  const cores = typeof os.availableParallelism === 'function' ? os.availableParallelism() : os.cpus().length;
  const wanted = Number.isInteger(fromEnv) && fromEnv > 0 ? fromEnv : Math.min(cores, MAX_THREADS, Math.floor(files / FILES_PER_THREAD));
  return Math.max(1, Math.min(wanted, files));
}

function workerFile(): string | null {
  // The bundle puts this module in dist/cli/chunks/ and the worker entry in dist/cli/.
  try {
    const file = fileURLToPath(new URL('../check-worker.js', import.meta.url));
    return existsSync(file) ? file : null;
  } catch {
    return null;
  }
}

function runWorker(file: string, texts: string[]): Promise<CheckedText[]> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(file, { workerData: { texts } });
    worker.once('message', (results: CheckedText[]) => resolve(results));
    worker.once('error', reject);
    worker.once('exit', (code) => {
      if (code !== 0) reject(new Error(`a check thread stopped with code ${code}`));
    });
  });
}

/** Checks the texts, in worker threads when there are many; the main thread takes the first share. */
export async function checkTexts(texts: readonly string[]): Promise<CheckedText[]> {
  const threads = threadCount(texts.length);
  const worker = threads > 1 ? workerFile() : null;
  if (!worker) return texts.map(checkText);
  const size = Math.ceil(texts.length / threads);
  const shards = Array.from({ length: threads }, (_, i) => texts.slice(i * size, (i + 1) * size)).filter((s) => s.length > 0);
  const pending = shards.slice(1).map((shard) => runWorker(worker, shard));
  const first = shards[0].map(checkText);
  return [first, ...(await Promise.all(pending))].flat();
}

export interface CheckFilesOptions {
  /** Use and update the cache of earlier results (never for --explain, which needs the figures). */
  cache: boolean;
}

/** The one finding of a file that is not UTF-8: the server would refuse it unread. */
function notUtf8Result(at: { line: number; column: number }): CheckedText {
  const finding: Finding = { ruleId: 'yaml-syntax', severity: 'error', message: 'the file is not UTF-8 text: save it as UTF-8 (the server refuses it as it is)', path: '', line: at.line, column: at.column };
  return { site: null, findings: [finding], summary: null };
}

export async function checkFiles(files: readonly SiteFile[], options: CheckFilesOptions): Promise<CheckedFile[]> {
  const read = readSiteFiles(files, { notUtf8: 'report' });
  const cache = options.cache ? openCheckCache() : null;
  const keys = cache ? read.map((f) => textKey(f.text)) : [];
  const results: (CheckedText | null)[] = read.map((f, i) => (f.notUtf8 ? notUtf8Result(f.notUtf8) : cache ? cache.get(keys[i]) : null));
  const missing = results.flatMap((r, i) => (r ? [] : [i]));
  const fresh = await checkTexts(missing.map((i) => read[i].text));
  missing.forEach((fileIndex, k) => {
    results[fileIndex] = fresh[k];
    cache?.set(keys[fileIndex], fresh[k]);
  });
  cache?.save(new Set(keys));
  return read.map((f, i) => ({ path: f.path, site: results[i]!.site, findings: results[i]!.findings, summary: results[i]!.summary }));
}
