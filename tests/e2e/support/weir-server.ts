// Builds Weir and runs the real server on 127.0.0.1 with a random free port, a temporary data
// folder and the seeded demo, for the browser tests.
import { execa, type ResultPromise } from 'execa';
import { existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');
export const DEMO_PASSWORD = 'e2e-demo-password-7351';
// The server wants at least 32 characters (server/config.ts).
const JWT_SECRET = 'e2e-secret-for-the-reviewer-tests-only-0000';

export interface RunningServer {
  url: string;
  dataDir: string;
  log: () => string;
  stop: () => Promise<void>;
}

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const probe = createServer();
    probe.once('error', reject);
    probe.listen(0, '127.0.0.1', () => {
      const address = probe.address();
      probe.close(() => (typeof address === 'object' && address ? resolve(address.port) : reject(new Error('no port'))));
    });
  });
}

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

/**
 * Builds the reviewer and the server. The server part may still be being written by someone
 * else while these tests are developed, so wait (up to `waitMs`) until its build succeeds.
 */
export async function buildAll(waitMs: number): Promise<void> {
  await execa('npm', ['run', 'build:web'], { cwd: ROOT, stdio: 'pipe' });
  const deadline = Date.now() + waitMs;
  let lastError = '';
  for (;;) {
    if (existsSync(path.join(ROOT, 'server/main.ts'))) {
      const result = await execa('npm', ['run', 'build:server'], { cwd: ROOT, reject: false, stdio: 'pipe' });
      if (result.exitCode === 0) return;
      lastError = `${result.stdout}\n${result.stderr}`;
    } else {
      lastError = 'server/main.ts does not exist yet';
    }
    if (Date.now() > deadline) throw new Error(`the server could not be built: ${lastError.slice(-2000)}`);
    await sleep(10_000);
  }
}

export async function startServer(): Promise<RunningServer> {
  const dataDir = await mkdtemp(path.join(tmpdir(), 'weir-e2e-'));
  const port = await freePort();
  const env = {
    PORT: String(port),
    HOST: '127.0.0.1',
    WEIR_DATA_DIR: dataDir,
    JWT_SECRET,
    WEIR_DEMO_PASSWORD: DEMO_PASSWORD,
    WEIR_LOG_LEVEL: 'warn',
    NODE_ENV: 'test',
  };
  await execa('node', ['dist/server.js', 'seed'], { cwd: ROOT, env, stdio: 'pipe' });

  let output = '';
  const child: ResultPromise = execa('node', ['dist/server.js'], { cwd: ROOT, env, reject: false, stdio: 'pipe', cleanup: true });
  child.stdout?.on('data', (d: Buffer) => { output += d.toString(); });
  child.stderr?.on('data', (d: Buffer) => { output += d.toString(); });

  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 30_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server exited early:\n${output.slice(-3000)}`);
    try {
      const res = await fetch(`${url}/api/health`);
      if (res.ok) break;
    } catch {
      // not listening yet
    }
    if (Date.now() > deadline) {
      child.kill();
      throw new Error(`the server did not answer /api/health:\n${output.slice(-3000)}`);
    }
    await sleep(200);
  }

  return {
    url,
    dataDir,
    log: () => output,
    stop: async () => {
      child.kill('SIGTERM');
      await Promise.race([child, sleep(5_000)]);
      if (child.exitCode === null) child.kill('SIGKILL');
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

/** A direct API call, for arranging a case (the tests then act through the browser). */
export async function apiAs(server: RunningServer, email: string) {
  const login = await fetch(`${server.url}/api/auth/login`, {
    method: 'POST',
    headers: { 'Content-Type': 'application/json' },
    body: JSON.stringify({ email, password: DEMO_PASSWORD }),
  });
  if (!login.ok) throw new Error(`sign-in of ${email} failed: ${login.status} ${await login.text()}`);
  const { token } = (await login.json()) as { token: string };
  return async function call<T = unknown>(pathname: string, init: RequestInit = {}): Promise<{ status: number; body: T }> {
    const res = await fetch(`${server.url}/api${pathname}`, { ...init, headers: { Authorization: `Bearer ${token}`, ...(init.headers as Record<string, string>) } });
    const text = await res.text();
    let body: unknown = text;
    try { body = JSON.parse(text); } catch { /* not JSON */ }
    return { status: res.status, body: body as T };
  };
}
