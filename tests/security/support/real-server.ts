// The real server (dist/server.js, from `npm run build:server`) as a child process: 127.0.0.1, a
// port of the system's choosing, a data folder of the test's choosing, and kill / restart on
// that folder, for the tests that need a process to die (crash safety) or several processes to
// share one file.
import { execa, type ResultPromise } from 'execa';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
export const SERVER_JS = path.join(ROOT, 'dist', 'server.js');
export const WEIR_JS = path.join(ROOT, 'bin', 'weir.js');
export const DEMO_PASSWORD = 'security-demo-password-4417';
/** At least 32 characters (server/config.ts). */
export const JWT_SECRET = 'security-tests-secret-0123456789-abcdefgh';

export function assertServerBuilt(): void {
  if (!existsSync(SERVER_JS)) throw new Error('the server is not built: run `npm run build:server` first (npm test does)');
}

export function assertCliBuilt(): void {
  if (!existsSync(path.join(ROOT, 'dist', 'cli', 'index.js'))) throw new Error('the CLI is not built: run `npm run build:cli` first (npm test does)');
}

export const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/** The environment of a server on `dataDir`: no demo sites (the tests push their own), no reviewer. */
export function serverEnv(dataDir: string, extra: Record<string, string> = {}): Record<string, string> {
  return {
    HOST: '127.0.0.1',
    WEIR_DATA_DIR: dataDir,
    JWT_SECRET,
    WEIR_DEMO_PASSWORD: DEMO_PASSWORD,
    WEIR_EXAMPLES_DIR: path.join(dataDir, 'no-examples'),
    WEIR_WEB_DIR: path.join(dataDir, 'no-web'),
    WEIR_LOG_LEVEL: 'warn',
    WEIR_LOGIN_RATE_LIMIT: '1000',
    ...extra,
  };
}

/** `node dist/server.js <args>` run to its end, e.g. `seed` or `backup <file>`. */
export function serverCommand(args: string[], dataDir: string, extra: Record<string, string> = {}) {
  return execa('node', [SERVER_JS, ...args], { cwd: ROOT, env: serverEnv(dataDir, extra), reject: false, timeout: 90_000 });
}

export interface RealServer {
  url: string;
  port: number;
  dataDir: string;
  child: ResultPromise;
  /** Everything the process wrote, for failure messages. */
  output(): string;
  alive(): boolean;
  kill(signal: 'SIGKILL' | 'SIGTERM'): Promise<void>;
}

/**
 * Starts `node dist/server.js` on `dataDir` with PORT=0 (the system picks a free port, read back
 * from the first line it prints) and waits until /api/health answers 200.
 */
export async function startRealServer(dataDir: string, extra: Record<string, string> = {}): Promise<RealServer> {
  assertServerBuilt();
  const child: ResultPromise = execa('node', [SERVER_JS], { cwd: ROOT, env: serverEnv(dataDir, { PORT: '0', ...extra }), reject: false, buffer: false, stdout: 'pipe', stderr: 'pipe', cleanup: true });
  let output = '';
  let exited = false;
  child.stdout?.on('data', (d: Buffer) => { output += d.toString(); });
  child.stderr?.on('data', (d: Buffer) => { output += d.toString(); });
  child.once('exit', () => { exited = true; });
  const deadline = Date.now() + 30_000;
  let url: string | null = null;
  for (;;) {
    if (exited) throw new Error(`the server on ${dataDir} exited before serving:\n${output.slice(-3000)}`);
    url ??= /serving on (http:\/\/127\.0\.0\.1:\d+)/.exec(output)?.[1] ?? null;
    if (url) {
      try {
        if ((await fetch(`${url}/api/health`)).status === 200) break;
      } catch {
        // not answering yet
      }
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`the server on ${dataDir} never answered /api/health:\n${output.slice(-3000)}`);
    }
    await sleep(50);
  }
  return {
    url,
    port: Number(new URL(url).port),
    dataDir,
    child,
    output: () => output,
    alive: () => !exited,
    async kill(signal) {
      if (!exited) child.kill(signal);
      await child;
    },
  };
}

export async function login(url: string, email: string, password = DEMO_PASSWORD): Promise<string> {
  const res = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
  if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}: ${await res.text()}`);
  return ((await res.json()) as { token: string }).token;
}

export interface Answer<T> {
  status: number;
  body: T;
}

export async function pushYaml<T = { revision: { id: number; number: number; state: string }; created: boolean }>(url: string, token: string, text: string): Promise<Answer<T>> {
  const res = await fetch(`${url}/api/revisions`, { method: 'POST', headers: { authorization: `Bearer ${token}`, 'content-type': 'application/yaml' }, body: text });
  return { status: res.status, body: (await res.json()) as T };
}

export async function getJson<T>(url: string, token: string, route: string): Promise<Answer<T>> {
  const res = await fetch(`${url}${route}`, { headers: { authorization: `Bearer ${token}` } });
  return { status: res.status, body: (await res.json()) as T };
}
