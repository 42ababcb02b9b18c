// Turns the paths given on the command line (files, folders, globs) into the list of site files,
// and reads them. Every I/O problem becomes a CliError (exit 2) with a one-line message.
import { readdirSync, readFileSync, statSync, type Dirent } from 'node:fs';
import path from 'node:path';
import { CliError } from './errors.ts';

export const SITE_FILE_PATTERN = /\.ya?ml$/i;
/** Folders never searched for site files. */
const SKIPPED_FOLDERS = new Set(['node_modules']);
const GLOB_CHARS = /[*?[\]{}]/;

export interface SiteFile {
  /** As shown in output: relative to the cwd when given relatively, forward slashes. */
  path: string;
  absolute: string;
}

export interface ReadSiteFile extends SiteFile {
  text: string;
  /** Set when the bytes are not UTF-8 (only with `notUtf8: 'report'`): where the first bad ones are. */
  notUtf8?: { line: number; column: number };
}

const display = (p: string) => p.split(path.sep).join('/');

export function ioMessage(err: unknown): string {
  const code = (err as NodeJS.ErrnoException)?.code;
  switch (code) {
    case 'ENOENT': return 'no such file or folder';
    case 'EACCES': case 'EPERM': return 'permission denied';
    case 'EISDIR': return 'is a folder';
    case 'ENOTDIR': return 'a part of the path is not a folder';
    case 'ELOOP': return 'too many symbolic links';
    default: return (err as Error)?.message ?? String(err);
  }
}

function walk(folderAbs: string, folderShown: string, out: SiteFile[]): void {
  let entries: Dirent[];
  try {
    entries = readdirSync(folderAbs, { withFileTypes: true });
  } catch (err) {
    throw new CliError(`cannot read ${display(folderShown)}: ${ioMessage(err)}`);
  }
  entries.sort((a, b) => (a.name < b.name ? -1 : a.name > b.name ? 1 : 0));
  for (const entry of entries) {
    const abs = path.join(folderAbs, entry.name);
    const shown = path.join(folderShown, entry.name);
    if (entry.isDirectory()) {
      // Hidden folders (.git, .cache) and dependencies hold no site files.
      if (entry.name.startsWith('.') || SKIPPED_FOLDERS.has(entry.name)) continue;
      walk(abs, shown, out);
    } else if (SITE_FILE_PATTERN.test(entry.name) && (entry.isFile() || entry.isSymbolicLink())) {
      // A symbolic link is followed only to a file; linked folders are not walked (no loops).
      if (entry.isSymbolicLink()) {
        try {
          if (!statSync(abs).isFile()) continue;
        } catch {
          continue;
        }
      }
      out.push({ path: display(shown), absolute: abs });
    }
  }
}

async function expandGlob(pattern: string, cwd: string): Promise<SiteFile[]> {
  const { glob } = await import('tinyglobby');
  const matches = await glob([pattern], { cwd, onlyFiles: true, dot: false, ignore: ['**/node_modules/**'], expandDirectories: false });
  matches.sort();
  return matches.map((m) => {
    const abs = path.resolve(cwd, m);
    return { path: display(path.isAbsolute(pattern) ? abs : path.relative(cwd, abs)), absolute: abs };
  });
}

/**
 * The site files named by `inputs`: a file is taken as it is, a folder is searched recursively
 * for *.yaml and *.yml, and anything with glob characters that is not an existing path is a
 * glob. No inputs means the current folder. Duplicates are dropped, order is kept.
 */
export async function resolveSiteFiles(inputs: readonly string[], cwd: string = process.cwd()): Promise<SiteFile[]> {
  const list = inputs.length > 0 ? inputs : ['.'];
  const out: SiteFile[] = [];
  const seen = new Set<string>();
  const add = (files: SiteFile[]) => {
    for (const f of files) {
      if (seen.has(f.absolute)) continue;
      seen.add(f.absolute);
      out.push(f);
    }
  };
  for (const input of list) {
    if (input === '') throw new CliError('an empty path was given');
    const abs = path.resolve(cwd, input);
    let stats;
    try {
      stats = statSync(abs);
    } catch (err) {
      if ((err as NodeJS.ErrnoException)?.code === 'ENOENT' && GLOB_CHARS.test(input)) {
        const matched = await expandGlob(input, cwd);
        if (matched.length === 0) throw new CliError(`no files match ${input}`);
        add(matched);
        continue;
      }
      throw new CliError(`cannot read ${input}: ${ioMessage(err)}`);
    }
    if (stats.isDirectory()) {
      const found: SiteFile[] = [];
      walk(abs, path.isAbsolute(input) ? abs : path.normalize(input), found);
      if (found.length === 0) throw new CliError(`no site files (*.yaml, *.yml) in ${input}`);
      add(found);
    } else {
      add([{ path: display(path.isAbsolute(input) ? abs : path.normalize(input)), absolute: abs }]);
    }
  }
  return out;
}

const strictUtf8 = new TextDecoder('utf-8', { fatal: true });

/** Where a file's first bytes that are not UTF-8 are, 1-based (line and column of the text before them). */
function firstBadByte(bytes: Buffer): { line: number; column: number } {
  // The longest prefix that decodes; a cut-off character at its end does not count as bad.
  let lo = 0;
  let hi = bytes.length;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    try {
      // A fresh decoder each time: streaming leaves state behind in the one used.
      new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, mid), { stream: true });
      lo = mid;
    } catch {
      hi = mid - 1;
    }
  }
  // Streaming, the decoder holds back a cut-off character at the end: the text before the bad bytes.
  const before = new TextDecoder('utf-8', { fatal: true }).decode(bytes.subarray(0, lo), { stream: true }).split('\n');
  return { line: before.length, column: [...before[before.length - 1]].length + 1 };
}

export interface ReadSiteFileOptions {
  /**
   * Bytes that are not UTF-8 (the server refuses such a file with 400 invalid-encoding): by
   * default they stop the command; `report` keeps the file with `notUtf8` set, for a finding.
   */
  notUtf8?: 'stop' | 'report';
}

/** Reads every file; the first one that cannot be read stops the command (exit 2). */
export function readSiteFiles(files: readonly SiteFile[], options: ReadSiteFileOptions = {}): ReadSiteFile[] {
  return files.map((f) => {
    let bytes: Buffer;
    try {
      bytes = readFileSync(f.absolute);
    } catch (err) {
      throw new CliError(`cannot read ${f.path}: ${ioMessage(err)}`);
    }
    try {
      return { ...f, text: strictUtf8.decode(bytes) };
    } catch {
      const at = firstBadByte(bytes);
      if (options.notUtf8 === 'report') return { ...f, text: bytes.toString('utf8'), notUtf8: at };
      throw new CliError(`cannot read ${f.path}: it is not UTF-8 text (line ${at.line}, column ${at.column})`, 2, 'save the file as UTF-8');
    }
  });
}

export async function loadSiteFiles(inputs: readonly string[], cwd?: string): Promise<ReadSiteFile[]> {
  return readSiteFiles(await resolveSiteFiles(inputs, cwd));
}
