// Shared set-up of the API tests: a fresh data folder and app per test file, a few accounts.
import { mkdtemp, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { pino } from 'pino';
import request from 'supertest';
import { createApp } from '../../server/app.ts';
import type { Role } from '../../server/auth/permissions.ts';
import { loadConfig, type Config } from '../../server/config.ts';
import { openRuntime, type Runtime } from '../../server/runtime.ts';
import { createServices } from '../../server/services.ts';

export const PASSWORD = 'test-password-1';
const here = path.dirname(fileURLToPath(import.meta.url));

export interface TestWeir {
  app: ReturnType<typeof createApp>;
  runtime: Runtime;
  config: Config;
  dataDir: string;
  close(): Promise<void>;
}

export async function startWeir(env: NodeJS.ProcessEnv = {}, overrides: Partial<Config> = {}): Promise<TestWeir> {
  const dataDir = await mkdtemp(path.join(os.tmpdir(), 'weir-api-'));
  const config = loadConfig({ WEIR_LOGIN_RATE_LIMIT: '1000', ...env }, { dataDir, logLevel: 'silent', ...overrides });
  const runtime = await openRuntime(config, { logger: pino({ level: process.env.WEIR_TEST_LOG ?? 'silent' }) });
  const app = createApp(runtime);
  return {
    app,
    runtime,
    config,
    dataDir,
    async close() {
      await runtime.close();
      await rm(dataDir, { recursive: true, force: true });
    },
  };
}

export interface Account {
  id: number;
  email: string;
  role: Role;
  token: string;
  auth: { Authorization: string };
}

/** Creates an account through the users service (as the seed does) and signs it in over HTTP. */
export async function account(weir: TestWeir, role: Role, name: string = role): Promise<Account> {
  const email = `${name}@example.test`;
  const user = await createServices(weir.runtime).users.create({ email, name: `Test ${name}`, role, password: PASSWORD }, null);
  const res = await request(weir.app).post('/api/auth/login').send({ email, password: PASSWORD }).expect(200);
  return { id: user.id, email, role, token: res.body.token, auth: { Authorization: `Bearer ${res.body.token}` } };
}

/** The valid site file of the fixtures, optionally with text replaced to make a variant. */
export async function siteText(replacements: [string | RegExp, string][] = [], file = 'mill-lane.yaml'): Promise<string> {
  let text = await readFile(path.join(here, 'fixtures', file), 'utf8');
  for (const [from, to] of replacements) {
    const next = text.replace(from, to);
    if (next === text) throw new Error(`fixture has no ${String(from)}`);
    text = next;
  }
  return text;
}

export function push(weir: TestWeir, who: Account, text: string, message?: string) {
  const req = request(weir.app).post('/api/revisions').set(who.auth).set('Content-Type', 'application/yaml');
  if (message) req.query({ message });
  return req.send(text);
}

export function review(weir: TestWeir, who: Account, revisionId: number, decision: 'approve' | 'return', comment?: string) {
  return request(weir.app)
    .post(`/api/revisions/${revisionId}/review`)
    .set(who.auth)
    .send(comment === undefined ? { decision } : { decision, comment });
}

/** A variant with one more inverter on L1: still valid, a different text. */
export const oneMoreUnit = (): [string, string][] => [['{ id: roof-east, units: 6,', '{ id: roof-east, units: 7,']];
/** ct-undersized: a 50 A CT on an 80 A service (rules.md "CTs", common practice). */
export const undersizedCts = (): [RegExp, string][] => [[/ratedPrimaryA: 100/g, 'ratedPrimaryA: 50']];
