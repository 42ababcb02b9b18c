// Reads and checks many site files. Past a few hundred files the work is split between worker
// threads (one per core, at most 4), each reading and checking its share; results keep the
// order of the files. The engine is the same in every thread.
import { existsSync, readFileSync } from 'node:fs';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { checkSite, type Finding, type SiteSummary } from '../../shared/index.ts';
import { CliError } from './errors.ts';
import { ioMessage, type SiteFile } from './site-files.ts';
import { siteIdOf } from './site-id.ts';

export interface CheckedFile {
  path: string;
  site: string | null;
  findings: Finding[];
  summary: SiteSummary | null;
  /** The file's text, kept only when asked for. */
  text?: string;
}

/** Below this many files per thread, starting a thread costs more than it saves. */
const FILES_PER_THREAD = 150;
const MAX_THREADS = 4;

export type ShardAnswer = { ok: true; results: CheckedFile[] } | { ok: false; index: number; message: string };

/** Reads every file of the shard first (so an unreadable one stops before any work), then checks. */
export function checkShard(files: readonly SiteFile[], offset = 0): ShardAnswer {
  const texts: string[] = [];
  for (let i = 0; i < files.length; i++) {
    try {
      texts.push(readFileSync(files[i].absolute, 'utf8'));
    } catch (err) {
      return { ok: false, index: offset + i, message: `cannot read ${files[i].path}: ${ioMessage(err)}` };
    }
  }
  return {
    ok: true,
    results: files.map((file, i) => {
      const result = checkSite(texts[i]);
      return { path: file.path, site: siteIdOf(result.data), findings: result.findings, summary: result.summary };
    }),
  };
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

function runWorker(file: string, files: SiteFile[], offset: number): Promise<ShardAnswer> {
  return new Promise((resolve, reject) => {
    const worker = new Worker(file, { workerData: { files, offset } });
    worker.once('message', (answer: ShardAnswer) => resolve(answer));
    worker.once('error', reject);
    worker.once('exit', (code) => {
      if (code !== 0) reject(new Error(`a check thread stopped with code ${code}`));
    });
  });
}

export async function checkFiles(files: readonly SiteFile[]): Promise<CheckedFile[]> {
  const threads = threadCount(files.length);
  const worker = threads > 1 ? workerFile() : null;
  let answers: ShardAnswer[];
  if (!worker) {
    answers = [checkShard(files)];
  } else {
    const size = Math.ceil(files.length / threads);
    const shards = Array.from({ length: threads }, (_, i) => ({ offset: i * size, files: files.slice(i * size, (i + 1) * size) })).filter((s) => s.files.length > 0);
    // The main thread takes the first share while the workers take the rest.
    const pending = shards.slice(1).map((s) => runWorker(worker, s.files, s.offset));
    const first = checkShard(shards[0].files, 0);
    answers = [first, ...(await Promise.all(pending))];
  }
  const failures = answers.filter((a): a is Extract<ShardAnswer, { ok: false }> => !a.ok).sort((a, b) => a.index - b.index);
  if (failures.length) throw new CliError(failures[0].message);
  return answers.flatMap((a) => (a.ok ? a.results : []));
}
