// Results of earlier checks, so that `weir check` over a folder where few files changed reads
// only the changed ones again (as linters do). Kept in $XDG_CACHE_HOME/weir/check-cache.json
// (default ~/.cache/weir), keyed by the sha256 of each file's exact text and valid only for the
// engine build that wrote it: the build stamps __WEIR_ENGINE_ID__, a hash of the engine's sources,
// the schema and the yaml package. WEIR_NO_CACHE=1 or --no-cache turns it off. A cache that
// cannot be read or written is simply not used.
import { createHash } from 'node:crypto';
import { chmodSync, mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { Finding } from '../../shared/index.ts';
import type { CheckedText } from './check-files.ts';

declare const __WEIR_ENGINE_ID__: string | undefined;
const ENGINE_ID: string | null = typeof __WEIR_ENGINE_ID__ === 'string' ? __WEIR_ENGINE_ID__ : null;

/** Enough for a large fleet; the files of the latest run are always kept. */
const MAX_ENTRIES = 20_000;

interface Entry {
  /** site id */
  s: string | null;
  /** findings */
  f: Finding[];
}

export interface CheckCache {
  get(key: string): CheckedText | null;
  set(key: string, result: CheckedText): void;
  /** Writes the cache if anything was added, keeping `used` first. */
  save(used: Set<string>): void;
}

export function cacheFolder(env: NodeJS.ProcessEnv = process.env): string {
  const xdg = env.XDG_CACHE_HOME;
  return path.join(xdg && path.isAbsolute(xdg) ? xdg : path.join(os.homedir(), '.cache'), 'weir');
}

/** The cache key of a file: its exact text (a byte-order mark changes columns, so it counts). */
export function textKey(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('base64url');
}

export function openCheckCache(): CheckCache | null {
  if (!ENGINE_ID || (process.env.WEIR_NO_CACHE && process.env.WEIR_NO_CACHE !== '0')) return null;
  const folder = cacheFolder();
  const file = path.join(folder, 'check-cache.json');
  let entries: Record<string, Entry> = {};
  try {
    const stored = JSON.parse(readFileSync(file, 'utf8')) as { engine?: string; entries?: Record<string, Entry> };
    if (stored.engine === ENGINE_ID && stored.entries && typeof stored.entries === 'object') entries = stored.entries;
  } catch {
    // no cache yet, or one that is not ours: start afresh
  }
  let dirty = false;
  return {
    get(key) {
      const e = Object.prototype.hasOwnProperty.call(entries, key) ? entries[key] : undefined;
      if (!e || !Array.isArray(e.f)) return null;
      return { site: e.s ?? null, findings: e.f, summary: null };
    },
    set(key, result) {
      entries[key] = { s: result.site, f: result.findings };
      dirty = true;
    },
    save(used) {
      if (!dirty) return;
      const kept: Record<string, Entry> = {};
      let n = 0;
      for (const key of used) if (entries[key] && n < MAX_ENTRIES) { kept[key] = entries[key]; n++; }
      for (const key of Object.keys(entries)) if (!(key in kept) && n < MAX_ENTRIES) { kept[key] = entries[key]; n++; }
      try {
        mkdirSync(folder, { recursive: true, mode: 0o700 });
        const temp = `${file}.${process.pid}.tmp`;
        writeFileSync(temp, JSON.stringify({ engine: ENGINE_ID, entries: kept }), { mode: 0o600 });
        chmodSync(temp, 0o600);
        renameSync(temp, file);
      } catch {
        // a read-only home: the next run checks again, nothing worse
      }
    },
  };
}
