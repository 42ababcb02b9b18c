// Child of bench/api.ts: runs the real app in-process on a copy of the fleet's database, records
// the SQL that the list and single-revision routes send to SQLite (Sequelize's logging hook),
// and prints, as JSON, each statement with its time and its EXPLAIN QUERY PLAN.
//   node --import tsx bench/api-queries.ts <data dir> <revision id> <email> <password> <site file to push>
import { readFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { pino } from 'pino';
import { createApp } from '../server/app.ts';
import { loadConfig } from '../server/config.ts';
import { openRuntime } from '../server/runtime.ts';

const [dataDir, revisionId, email, password, pushFile] = process.argv.slice(2);
const config = loadConfig({ ...process.env, WEIR_DATA_DIR: dataDir }, { jwtSecret: 'x'.repeat(48), webDir: null, logLevel: 'silent' });
const runtime = await openRuntime(config, { logger: pino({ level: 'silent' }) });
const sequelize = runtime.db.sequelize;

let recording: { sql: string; ms: number }[] | null = null;
// Sequelize reads these options on every query (they are not in its typings), so setting them
// now hooks every later one.
const options = (sequelize as unknown as { options: { benchmark: boolean; logging: (sql: string, ms?: number) => void } }).options;
options.benchmark = true;
options.logging = (sql, ms) => {
  recording?.push({ sql: sql.replace(/^Executed \([^)]*\): /, ''), ms: ms ?? NaN });
};

const server = createApp(runtime).listen(0, '127.0.0.1');
await new Promise((r) => server.once('listening', r));
const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

const login = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
const { token } = (await login.json()) as { token: string };
const headers = { authorization: `Bearer ${token}` };

async function record(path: string, push?: string) {
  const send = (body?: string) => fetch(base + path, body === undefined ? { headers } : { method: 'POST', headers: { ...headers, 'content-type': 'application/yaml' }, body });
  // Once to warm the caches (a push of another site), then once recorded.
  await (await send(push?.replace(/\n {2}id: (\S+)/, '\n  id: $1-warm'))).arrayBuffer();
  recording = [];
  const t0 = performance.now();
  const res = await send(push);
  await res.arrayBuffer();
  const totalMs = performance.now() - t0;
  const statements = recording;
  recording = null;
  const out = [];
  for (const s of statements) {
    const plan = /^\s*SELECT/i.test(s.sql) ? ((await sequelize.query(`EXPLAIN QUERY PLAN ${s.sql.replace(/;\s*$/, '')}`, { type: 'SELECT', logging: false })) as { detail: string }[]).map((r) => r.detail) : [];
    out.push({ sql: s.sql, ms: s.ms, plan });
  }
  return { path: push === undefined ? `GET ${path}` : `POST ${path}`, status: res.status, totalMs, statements: out };
}

const result = [await record('/api/sites?limit=50'), await record(`/api/revisions/${revisionId}`), await record('/api/revisions', readFileSync(pushFile, 'utf8'))];
server.close();
await runtime.close();
process.stdout.write(JSON.stringify(result));
