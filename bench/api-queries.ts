// Child of bench/api.ts: runs the real app in-process on a copy of the fleet's database, records
// the SQL that the list, single-revision and push routes send to SQLite (every statement of
// every connection, as SQLite's profile hook reports it), and prints, as JSON, each statement
// with its time and its EXPLAIN QUERY PLAN.
//   node --import tsx bench/api-queries.ts <data dir> <revision id> <email> <password> <site file to push>
import { readFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import { pino } from 'pino';
import { createApp } from '../server/app.ts';
import { loadConfig } from '../server/config.ts';
import { openRuntime } from '../server/runtime.ts';

const [dataDir, revisionId, email, password, pushFile] = process.argv.slice(2);
const config = loadConfig({ ...process.env, WEIR_DATA_DIR: dataDir }, { jwtSecret: 'x'.repeat(48), webDir: null, logLevel: 'silent' });
let recording: { sql: string; ms: number }[] | null = null;
const runtime = await openRuntime(config, {
  logger: pino({ level: 'silent' }),
  onStatement: (sql, ms) => recording?.push({ sql: sql.trim().replace(/\s+/g, ' '), ms: Math.round(ms * 100) / 100 }),
});

const server = createApp(runtime).listen(0, '127.0.0.1');
await new Promise((r) => server.once('listening', r));
const base = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;

const login = await fetch(`${base}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password }) });
const { token } = (await login.json()) as { token: string };
const headers = { authorization: `Bearer ${token}` };

async function record(path: string, push?: string, warmPath = path) {
  const send = (body?: string, at = path) => fetch(base + at, body === undefined ? { headers } : { method: 'POST', headers: { ...headers, 'content-type': 'application/yaml' }, body });
  // Once to warm up (a push of another site; another page of the list, whose kept answer would
  // leave nothing to record), then once recorded.
  await (await send(push?.replace(/\n {2}id: (\S+)/, '\n  id: $1-warm'), warmPath)).arrayBuffer();
  recording = [];
  const t0 = performance.now();
  const res = await send(push);
  await res.arrayBuffer();
  const totalMs = performance.now() - t0;
  // The profile reports arrive from SQLite's threads: let the last of them land.
  await new Promise((r) => setTimeout(r, 50));
  const statements = recording;
  recording = null;
  const out = [];
  for (const s of statements) {
    // Unbound parameters are NULL to EXPLAIN: the plan is the same.
    const plan = /^\s*SELECT/i.test(s.sql) ? (await runtime.db.sql().all<{ detail: string }>(`EXPLAIN QUERY PLAN ${s.sql.replace(/;\s*$/, '')}`)).map((r) => r.detail) : [];
    out.push({ sql: s.sql, ms: s.ms, plan });
  }
  return { path: push === undefined ? `GET ${path}` : `POST ${path}`, status: res.status, totalMs, statements: out };
}

const result = [await record('/api/sites?limit=50', undefined, '/api/sites?limit=49'), await record(`/api/revisions/${revisionId}`), await record('/api/revisions', readFileSync(pushFile, 'utf8'))];
server.close();
await runtime.close();
process.stdout.write(JSON.stringify(result));
