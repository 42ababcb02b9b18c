// Runs the built CLI (bin/weir.js -> dist/cli) as a user would, with execa, in a clean
// environment: no colour forcing, no server or token from the caller's shell, and private XDG
// config and cache folders so no test touches a real sign-in or cache.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { execa } from 'execa';

export const ROOT = fileURLToPath(new URL('../..', import.meta.url));
export const WEIR = path.join(ROOT, 'bin', 'weir.js');
export const EXAMPLES = path.join(ROOT, 'examples');

export function assertBuilt(): void {
  if (!existsSync(path.join(ROOT, 'dist', 'cli', 'index.js'))) {
    throw new Error('the CLI is not built: run `npm run build:cli` first');
  }
}

export interface RunOptions {
  cwd?: string;
  env?: Record<string, string | undefined>;
  input?: string;
}

const CLEARED = ['WEIR_SERVER', 'WEIR_TOKEN', 'FORCE_COLOR', 'NO_COLOR', 'WEIR_CHECK_THREADS', 'WEIR_DEBUG', 'WEIR_NO_CACHE'];

export interface RunResult {
  exitCode: number;
  stdout: string;
  stderr: string;
}

export async function weir(args: string[], options: RunOptions = {}): Promise<RunResult> {
  const env: Record<string, string | undefined> = {};
  for (const key of CLEARED) env[key] = undefined;
  const r = await execa('node', [WEIR, ...args], {
    cwd: options.cwd ?? ROOT,
    env: { ...env, XDG_CONFIG_HOME: privateHome('config'), XDG_CACHE_HOME: privateHome('cache'), ...options.env },
    extendEnv: true,
    reject: false,
    input: options.input,
    stdin: options.input === undefined ? 'ignore' : 'pipe',
    timeout: 60_000,
  });
  return { exitCode: r.exitCode ?? -1, stdout: String(r.stdout), stderr: String(r.stderr) };
}

const homes: Record<string, string> = {};
/** One folder per test file and kind, removed when the test process ends. */
export function privateHome(kind: 'config' | 'cache'): string {
  if (!homes[kind]) {
    homes[kind] = mkdtempSync(path.join(os.tmpdir(), `weir-cli-${kind}-`));
    if (Object.keys(homes).length === 1) process.once('exit', () => { for (const dir of Object.values(homes)) rmSync(dir, { recursive: true, force: true }); });
  }
  return homes[kind];
}

export function tempDir(prefix = 'weir-cli-'): { dir: string; remove: () => void } {
  const dir = mkdtempSync(path.join(os.tmpdir(), prefix));
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

export const ANSI = /\u001b\[[0-9;]*m/;
