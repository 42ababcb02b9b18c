// The API under load (autocannon, on 127.0.0.1, bounded in time) with the fleet's 10,000 sites
// and 100,000 revisions: the site list, single revisions, pushes of fresh files; and a bare
// Express route answering the list's JSON as the baseline, timed alternately with the list in
// the same run. Budgets: list p99 ≤ 25 ms, list throughput ≥ 0.4× the bare route, push ≥ 300
// revisions/s. Also the query plans of the list and revision queries.
import autocannon from 'autocannon';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, rmSync, writeFileSync } from 'node:fs';
import { join, relative } from 'node:path';
import { createRng, generateSites, type BaseSite, type GeneratedSite } from './generate-sites.ts';
import { BENCH_PASSWORD, BENCH_USERS, copyFleet, ensureFleet } from './lib/fleet.ts';
import { freePort, outDir, repoRoot, run, startServer, type RunningServer } from './lib/processes.ts';
import { summariseProfile } from './lib/profile.ts';
import { atLeast, atMost, skipped, type Figure } from './lib/report.ts';
import { fmt, median } from './lib/stats.ts';

const BENCH = 'api';
const CONNECTIONS = 10; // autocannon's default: a handful of busy clients at once
const LIST_P99_MS = 25;
const LIST_VS_BARE = 0.4;
const PUSH_PER_S = 300;

export const serverBuilt = () => existsSync(join(repoRoot, 'dist/server.js'));

export function serverEnv(dataDir: string, port: number): NodeJS.ProcessEnv {
  return {
    ...process.env,
    NODE_ENV: 'production',
    PORT: String(port),
    WEIR_DATA_DIR: dataDir,
    JWT_SECRET: randomBytes(36).toString('base64url'),
    WEIR_DEMO_PASSWORD: BENCH_PASSWORD,
    // Request logs at `info` would time the log pipe; warnings and errors still show.
    WEIR_LOG_LEVEL: 'warn',
  };
}

export async function signIn(url: string, email: string): Promise<string> {
  const res = await fetch(`${url}/api/auth/login`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email, password: BENCH_PASSWORD }) });
  if (!res.ok) throw new Error(`sign-in as ${email} answered ${res.status}: ${await res.text()}`);
  return ((await res.json()) as { token: string }).token;
}

interface Load {
  rps: number;
  p50: number;
  p99: number;
  ok: number;
  non2xx: number;
  errors: number;
  seconds: number;
}

async function load(opts: autocannon.Options): Promise<Load> {
  const r = await autocannon({ connections: CONNECTIONS, ...opts });
  return { rps: r.requests.average, p50: r.latency.p50, p99: r.latency.p99, ok: r['2xx'], non2xx: r.non2xx, errors: r.errors + r.timeouts, seconds: r.duration };
}

const describe = (l: Load) => `${fmt.int(l.rps)} req/s, p50 ${l.p50} ms, p99 ${l.p99} ms${l.non2xx || l.errors ? `, ${l.non2xx} non-2xx, ${l.errors} errors` : ''}`;

export async function benchApi({ quick, seed, bases }: { quick: boolean; seed: number; bases: BaseSite[] }): Promise<{ figures: Figure[]; notes: string[] }> {
  const sites = quick ? 2000 : 10_000;
  const revisions = sites * 10;
  const size = `${fmt.int(sites)} sites / ${fmt.int(revisions)} revisions`;
  if (!serverBuilt()) {
    return {
      figures: [
        skipped(BENCH, 'GET /api/sites?limit=50 p99', 'the server is not built (npm run build:server)', `≤ ${LIST_P99_MS} ms`),
        skipped(BENCH, 'GET /api/sites?limit=50 vs bare route', 'the server is not built', `≥ ${LIST_VS_BARE}×`),
        skipped(BENCH, 'POST /api/revisions', 'the server is not built', `≥ ${PUSH_PER_S}/s`),
      ],
      notes: [],
    };
  }
  const duration = quick ? 4 : 8;
  const rounds = quick ? 1 : 3;
  const notes: string[] = [];
  const fleet = await ensureFleet({ sites, revisions, seed, bases, log: (s) => notes.push(s) });
  if (fleet.cached) notes.push(`fleet of ${size} from the cache (${fleet.file.replace(repoRoot, '')})`);
  const dataDir = join(outDir, 'api/data');
  copyFleet(fleet, dataDir);

  const figures: Figure[] = [];
  const pool = generateSites(200, seed + 2, bases);
  let api: RunningServer | null = null;
  let bare: RunningServer | null = null;
  try {
    api = await startServer([join(repoRoot, 'dist/server.js')], serverEnv(dataDir, await freePort()));
    const installer = await signIn(api.url, BENCH_USERS[0].email);
    const lead = await signIn(api.url, BENCH_USERS[3].email);
    const auth = (token: string) => ({ authorization: `Bearer ${token}` });

    // The list's own answer becomes the bare route's constant body.
    const listPath = '/api/sites?limit=50';
    const listRes = await fetch(api.url + listPath, { headers: auth(lead) });
    const listBody = await listRes.text();
    if (!listRes.ok) throw new Error(`GET ${listPath} answered ${listRes.status}: ${listBody.slice(0, 300)}`);
    const list = JSON.parse(listBody) as { items: unknown[]; total: number };
    if (list.items.length !== 50 || list.total < sites) throw new Error(`GET ${listPath} gave ${list.items.length} items of ${list.total}, expected 50 of ${sites}`);
    const bodyFile = join(outDir, 'api/list-body.json');
    writeFileSync(bodyFile, listBody);
    bare = await startServer(['--import', 'tsx', join(repoRoot, 'bench/bare-server.ts')], { ...process.env, PORT: String(await freePort()), BENCH_BODY_FILE: bodyFile, NODE_ENV: 'production' });

    // Warm both, then alternate list and bare so drift hits both alike.
    const listOpts = { url: api.url + listPath, headers: auth(lead) };
    const bareOpts = { url: bare.url + listPath };
    await load({ ...listOpts, duration: 2 });
    await load({ ...bareOpts, duration: 2 });
    const listRuns: Load[] = [];
    const bareRuns: Load[] = [];
    for (let i = 0; i < rounds; i++) {
      listRuns.push(await load({ ...listOpts, duration }));
      bareRuns.push(await load({ ...bareOpts, duration }));
    }
    const listP99 = median(listRuns.map((l) => l.p99));
    const listRps = median(listRuns.map((l) => l.rps));
    const bareRps = median(bareRuns.map((l) => l.rps));
    const listErrors = listRuns.reduce((a, l) => a + l.non2xx + l.errors, 0);
    notes.push(...listRuns.map((l, i) => `list round ${i + 1}: ${describe(l)}; bare: ${describe(bareRuns[i])}`));
    figures.push(
      { bench: BENCH, figure: `GET ${listPath} p99 (${size})`, value: `${listP99} ms`, budget: `≤ ${LIST_P99_MS} ms`, result: listErrors ? 'OVER' : atMost(listP99, LIST_P99_MS), note: `${CONNECTIONS} connections, ${rounds} × ${duration} s; p50 ${median(listRuns.map((l) => l.p50))} ms; body ${fmt.kb(listBody.length)}${listErrors ? `; ${listErrors} failed requests` : ''}` },
      { bench: BENCH, figure: `GET ${listPath} throughput vs bare route`, value: `${fmt.int(listRps)} req/s`, baseline: `${fmt.int(bareRps)} req/s`, ratio: fmt.ratio(listRps / bareRps), budget: `≥ ${LIST_VS_BARE.toFixed(2)}×`, result: atLeast(listRps / bareRps, LIST_VS_BARE), note: `bare route p50 ${median(bareRuns.map((l) => l.p50))} ms, p99 ${median(bareRuns.map((l) => l.p99))} ms` },
    );
    await bare.stop();
    bare = null;

    // One client alone: the list's own service time, without queueing behind the others.
    const single = await load({ ...listOpts, connections: 1, duration: Math.max(2, duration / 2) });
    notes.push(`list, 1 connection: ${describe(single)}`);
    figures.push({ bench: BENCH, figure: `GET ${listPath}, 1 connection`, value: `p50 ${single.p50} ms, p99 ${single.p99} ms`, result: 'INFO', note: `${fmt.int(single.rps)} req/s with one client` });

    // Single revisions, picked at random (seeded) over the whole history.
    const rng = createRng(seed + 1);
    const revisionPath = () => `/api/revisions/${rng.int(1, revisions)}`;
    const revLoad = await load({ url: api.url, headers: auth(lead), duration, requests: [{ method: 'GET', setupRequest: (req) => ({ ...req, path: revisionPath() }) }] });
    notes.push(`revision GET: ${describe(revLoad)}`);
    figures.push({ bench: BENCH, figure: 'GET /api/revisions/:id (random ids)', value: `${fmt.int(revLoad.rps)} req/s`, result: revLoad.non2xx || revLoad.errors ? 'OVER' : 'INFO', note: `p50 ${revLoad.p50} ms, p99 ${revLoad.p99} ms${revLoad.non2xx ? `; ${revLoad.non2xx} non-2xx` : ''}` });

    // Pushes of fresh files: each request a new site (its own id), so each one stores a revision.
    const freshFile = freshFiles(pool, 'p');
    const pushLoad = await load({
      url: api.url,
      duration,
      headers: { ...auth(installer), 'content-type': 'application/yaml' },
      requests: [{ method: 'POST', path: '/api/revisions?message=bench', setupRequest: (req) => ({ ...req, body: freshFile() }) }],
    });
    const perSecond = pushLoad.ok / pushLoad.seconds;
    notes.push(`push: ${describe(pushLoad)}`);
    figures.push({ bench: BENCH, figure: 'POST /api/revisions (fresh files)', value: `${fmt.int(perSecond)} revisions/s`, budget: `≥ ${PUSH_PER_S}/s`, result: pushLoad.non2xx || pushLoad.errors ? 'OVER' : atLeast(perSecond, PUSH_PER_S), note: `p50 ${pushLoad.p50} ms, p99 ${pushLoad.p99} ms, ${pushLoad.ok} stored${pushLoad.non2xx ? `; ${pushLoad.non2xx} non-2xx` : ''}` });
  } finally {
    await bare?.stop();
    await api?.stop();
  }

  notes.push(...(await profileServer(dataDir, duration, pool)));
  const planned = generateSites(1, seed + 3, bases)[0];
  notes.push(...(await queryPlans(dataDir, revisions, planned.text.replace(`id: ${planned.id}`, `id: ${planned.id}-plan`))));
  rmSync(dataDir, { recursive: true, force: true }); // a working copy of most of a gigabyte
  return { figures, notes };
}

/** Site files never pushed before: the pool's, each under an id of its own. */
function freshFiles(pool: GeneratedSite[], tag: string) {
  let pushed = 0;
  return () => {
    const g = pool[pushed % pool.length];
    pushed++;
    return g.text.replace(`id: ${g.id}`, `id: ${g.id}-${tag}${pushed.toString(36)}`);
  };
}

/** A second, short pass under --cpu-prof (not timed: the profiler slows it), to show where the server's time goes. */
async function profileServer(dataDir: string, seconds: number, pool: GeneratedSite[]): Promise<string[]> {
  const dir = join(outDir, 'api/profile');
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const server = await startServer(['--cpu-prof', `--cpu-prof-dir=${dir}`, join(repoRoot, 'dist/server.js')], serverEnv(dataDir, await freePort()));
  try {
    const lead = await signIn(server.url, BENCH_USERS[3].email);
    const installer = await signIn(server.url, BENCH_USERS[0].email);
    await load({ url: `${server.url}/api/sites?limit=50`, headers: { authorization: `Bearer ${lead}` }, duration: seconds });
    const freshFile = freshFiles(pool, 'f');
    await load({ url: server.url, duration: seconds, headers: { authorization: `Bearer ${installer}`, 'content-type': 'application/yaml' }, requests: [{ method: 'POST', path: '/api/revisions?message=bench', setupRequest: (req) => ({ ...req, body: freshFile() }) }] });
  } finally {
    await server.stop();
  }
  const file = readdirSync(dir).find((f) => f.endsWith('.cpuprofile'));
  if (!file) return ['(no server profile: the server did not exit cleanly on SIGTERM)'];
  return [`CPU profile of the server's main thread under ${seconds} s of list load then ${seconds} s of pushes (${relative(repoRoot, join(dir, file))}):`, ...summariseProfile(join(dir, file), { top: 25 })];
}

interface Recorded {
  path: string;
  status: number;
  totalMs: number;
  statements: { sql: string; ms: number; plan: string[] }[];
}

const indexesOf = (plan: string[]) => [...new Set(plan.flatMap((p) => [...p.matchAll(/USING (?:COVERING )?INDEX (\S+)|USING (INTEGER PRIMARY KEY)/g)].map((m) => m[1] ?? m[2])))];

/** The SQL behind the list, revision and push routes, with the plan SQLite chose for each read. */
async function queryPlans(dataDir: string, revisions: number, pushText: string): Promise<string[]> {
  const pushFile = join(outDir, 'api/push-one.yaml');
  writeFileSync(pushFile, pushText);
  const res = await run(process.execPath, ['--import', 'tsx', join(repoRoot, 'bench/api-queries.ts'), dataDir, String(Math.ceil(revisions / 2)), BENCH_USERS[3].email, BENCH_PASSWORD, pushFile], { timeoutMs: 120_000, headBytes: 16 * 1024 * 1024 });
  if (res.code !== 0) return [`(query plans failed: exit ${res.code} ${res.stderrHead.slice(0, 500)})`];
  const out: string[] = ["Statements per request on every connection, each with its time (SQLite's profile hook, whole ms) and, for reads, its EXPLAIN QUERY PLAN (the list's is a first request: a kept answer needs only the sign-in read):"];
  for (const r of JSON.parse(res.stdoutHead) as Recorded[]) {
    const dbMs = r.statements.reduce((a, s) => a + (Number.isFinite(s.ms) ? s.ms : 0), 0);
    out.push(`  ${r.path} → ${r.status}: ${r.statements.length} statements, ${dbMs} ms in them, ${r.totalMs.toFixed(0)} ms for the request`);
    const long = !r.path.startsWith('POST');
    for (const s of r.statements) {
      const cut = long ? 400 : 160;
      out.push(`    [${Number.isFinite(s.ms) ? `${s.ms} ms` : '?'}] ${s.sql.length > cut ? `${s.sql.slice(0, cut)}…` : s.sql}`);
      for (const p of s.plan) out.push(`        ${p}`);
      const scans = s.plan.filter((p) => /^SCAN /.test(p) && !/USING/.test(p));
      if (s.plan.length) out.push(`        → indexes: ${indexesOf(s.plan).join(', ') || 'none'}${scans.length ? `; full scans: ${scans.map((p) => p.replace(/^SCAN /, '')).join(', ')}` : ''}`);
    }
  }
  return out;
}
