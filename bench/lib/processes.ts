// Child processes for the benches: run-to-completion commands whose output is drained (not
// kept), and servers on 127.0.0.1 that are always stopped again.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createServer } from 'node:net';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

export const repoRoot = fileURLToPath(new URL('../..', import.meta.url));
export const outDir = join(repoRoot, 'bench/.out');

export interface RunResult {
  code: number | null;
  stdoutBytes: number;
  /** The head of stdout and stderr (64 KB unless `headBytes`), for error messages and spot checks. */
  stdoutHead: string;
  stderrHead: string;
}

const HEAD = 64 * 1024;

/** Runs a command to completion. Output is counted and only its head kept, as a pipe reader would. */
export function run(cmd: string, args: readonly string[], opts: { env?: NodeJS.ProcessEnv; cwd?: string; timeoutMs?: number; headBytes?: number } = {}): Promise<RunResult> {
  const head = opts.headBytes ?? HEAD;
  return new Promise((resolvePromise, reject) => {
    const child = spawn(cmd, args, { cwd: opts.cwd ?? repoRoot, env: opts.env ?? process.env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdoutBytes = 0;
    let stdoutHead = '';
    let stderrHead = '';
    child.stdout.on('data', (chunk: Buffer) => {
      stdoutBytes += chunk.length;
      if (stdoutHead.length < head) stdoutHead += chunk.toString('utf8');
    });
    child.stderr.on('data', (chunk: Buffer) => {
      if (stderrHead.length < head) stderrHead += chunk.toString('utf8');
    });
    const timer = opts.timeoutMs ? setTimeout(() => child.kill('SIGKILL'), opts.timeoutMs) : undefined;
    child.on('error', reject);
    child.on('close', (code) => {
      if (timer) clearTimeout(timer);
      resolvePromise({ code, stdoutBytes, stdoutHead, stderrHead });
    });
  });
}

export function freePort(): Promise<number> {
  return new Promise((resolvePromise, reject) => {
    const srv = createServer();
    srv.unref();
    srv.on('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolvePromise(port));
    });
  });
}

export interface RunningServer {
  port: number;
  url: string;
  child: ChildProcess;
  logs: () => string;
  stop: () => Promise<void>;
}

/** Starts `node <args>` and waits until `healthPath` answers 200 on the port in env.PORT. */
export async function startServer(args: readonly string[], env: NodeJS.ProcessEnv, { healthPath = '/api/health', timeoutMs = 30_000 } = {}): Promise<RunningServer> {
  const port = Number(env.PORT);
  const child = spawn(process.execPath, args, { cwd: repoRoot, env, stdio: ['ignore', 'pipe', 'pipe'] });
  let logs = '';
  const keep = (chunk: Buffer) => {
    logs += chunk.toString('utf8');
    if (logs.length > 200_000) logs = logs.slice(-100_000);
  };
  child.stdout!.on('data', keep);
  child.stderr!.on('data', keep);
  let exited = false;
  const exitedPromise = new Promise<void>((r) => child.on('exit', () => { exited = true; r(); }));
  const stop = async () => {
    if (exited) return;
    child.kill('SIGTERM');
    const timer = setTimeout(() => child.kill('SIGKILL'), 5000);
    await exitedPromise;
    clearTimeout(timer);
  };
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    if (exited) throw new Error(`the server exited before it answered:\n${logs.slice(-4000)}`);
    try {
      const res = await fetch(url + healthPath);
      if (res.ok) return { port, url, child, logs: () => logs, stop };
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 100));
  }
  await stop();
  throw new Error(`the server did not answer ${healthPath} within ${timeoutMs} ms:\n${logs.slice(-4000)}`);
}

/** The CLI's launcher, once `npm run build:cli` has built what it launches. */
export function weirBin(): string | null {
  const bin = join(repoRoot, 'bin/weir.js');
  const built = existsSync(join(repoRoot, 'dist/cli.js')) || existsSync(join(repoRoot, 'dist/cli'));
  return existsSync(bin) && built ? bin : null;
}
