// Starts the real Weir server (dist/server.js, from `npm run build:server`) for CLI tests: a
// temporary data folder with its own SQLite file, demo accounts only (no demo sites), and a
// random free port chosen by the operating system (PORT=0) and read back from its first line.
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { execa, type ResultPromise } from 'execa';
import { ROOT } from './run-weir.ts';

export const DEMO_PASSWORD = 'cli-test-password-7';
/** The server wants at least 32 characters. */
const JWT_SECRET = 'cli-test-secret-0123456789-abcdefghij';
const SERVER = path.join(ROOT, 'dist', 'server.js');

export interface TestServer {
  url: string;
  dataDir: string;
  stop(): Promise<void>;
}

export function serverBuilt(): boolean {
  return existsSync(SERVER);
}

export async function startServer(): Promise<TestServer> {
  if (!serverBuilt()) throw new Error('the server is not built: run `npm run build:server` first');
  const dataDir = mkdtempSync(path.join(os.tmpdir(), 'weir-cli-server-'));
  const env = {
    PORT: '0',
    HOST: '127.0.0.1',
    WEIR_DATA_DIR: dataDir,
    JWT_SECRET,
    WEIR_DEMO_PASSWORD: DEMO_PASSWORD,
    // No examples folder: accounts only, so the tests push the fleet themselves.
    WEIR_EXAMPLES_DIR: path.join(dataDir, 'no-examples'),
    WEIR_LOG_LEVEL: 'warn',
    WEIR_WEB_DIR: path.join(dataDir, 'no-web'),
  };
  await execa('node', [SERVER, 'seed'], { cwd: ROOT, env, timeout: 60_000 });

  const child: ResultPromise = execa('node', [SERVER], { cwd: ROOT, env, reject: false, buffer: false, stdout: 'pipe', stderr: 'pipe' });
  let stderr = '';
  child.stderr?.on('data', (chunk: Buffer) => { stderr += chunk.toString(); });
  const url = await new Promise<string>((resolve, reject) => {
    let out = '';
    const timer = setTimeout(() => reject(new Error(`the server did not start within 30 s\n${out}${stderr}`)), 30_000);
    child.stdout?.on('data', (chunk: Buffer) => {
      out += chunk.toString();
      const m = /serving on (http:\/\/[\d.]+:\d+)/.exec(out);
      if (m) {
        clearTimeout(timer);
        resolve(m[1]);
      }
    });
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the server stopped with code ${code} before serving\n${out}${stderr}`));
    });
  });
  // Serving is announced after listen; the health route proves the app answers.
  const deadline = Date.now() + 15_000;
  for (;;) {
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.status === 200) break;
    } catch {
      // not yet
    }
    if (Date.now() > deadline) throw new Error(`GET ${url}/api/health never answered 200\n${stderr}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  return {
    url,
    dataDir,
    async stop() {
      child.kill('SIGTERM');
      await child;
      rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Signs in through the API directly (for the reviewer's side of a test, which has no CLI verb). */
export async function apiToken(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: DEMO_PASSWORD }) });
  if (res.status !== 200) throw new Error(`sign-in of ${email} answered ${res.status}`);
  return ((await res.json()) as { token: string }).token;
}

export async function api<T>(url: string, token: string, method: string, route: string, body?: unknown): Promise<{ status: number; body: T }> {
  const res = await fetch(`${url}${route}`, {
    method,
    headers: { authorization: `Bearer ${token}`, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
    body: body === undefined ? undefined : JSON.stringify(body),
  });
  return { status: res.status, body: (await res.json()) as T };
}
