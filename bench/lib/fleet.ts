// A large fleet for the API and reviewer benches: N sites and M revisions written straight into
// a SQLite file with the server's own migrations (server/db.ts), in one transaction with
// prepared inserts, never through HTTP. The seeded file is kept under bench/.out/fleet/<key>/
// and copied for each bench; the key covers everything that decides its content.
import { createHash } from 'node:crypto';
import { copyFileSync, existsSync, mkdirSync, readdirSync, readFileSync, rmSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import sqlite3 from 'sqlite3';
import { checkSite } from '../../shared/index.ts';
import { openDatabase } from '../../server/db.ts';
import { hashPassword } from '../../server/auth/passwords.ts';
import { deriveSiteStatus } from '../../server/sites/site.model.ts';
import { createRng, generateSites, type BaseSite } from '../generate-sites.ts';
import { outDir, repoRoot } from './processes.ts';

export const BENCH_PASSWORD = 'bench-password-2026';
export const BENCH_USERS = [
  { email: 'bench-installer-1@example.test', name: 'Bench Installer One', role: 'installer' },
  { email: 'bench-installer-2@example.test', name: 'Bench Installer Two', role: 'installer' },
  { email: 'bench-installer-3@example.test', name: 'Bench Installer Three', role: 'installer' },
  { email: 'bench-lead-1@example.test', name: 'Bench Lead One', role: 'lead' },
  { email: 'bench-lead-2@example.test', name: 'Bench Lead Two', role: 'lead' },
] as const;

export interface Fleet {
  /** The pristine database file; copy it, never open it for writing. */
  file: string;
  sites: number;
  revisions: number;
  seconds: number;
  cached: boolean;
}

function filesUnder(dir: string): string[] {
  const out: string[] = [];
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const p = join(dir, entry.name);
    if (entry.isDirectory()) out.push(...filesUnder(p));
    else if (/\.(ts|js|json)$/.test(entry.name) && !entry.name.endsWith('.test.ts')) out.push(p);
  }
  return out.sort();
}

/** Everything the seeded file depends on: the counts, the generator, the engine, the schema of the tables. */
function fleetKey(sites: number, revisions: number, seed: number, bases: BaseSite[]): string {
  const h = createHash('sha256').update(JSON.stringify({ sites, revisions, seed, bases }));
  const inputs = [join(repoRoot, 'bench/generate-sites.ts'), join(repoRoot, 'bench/lib/fleet.ts'), ...filesUnder(join(repoRoot, 'shared')), ...filesUnder(join(repoRoot, 'server/migrations'))];
  for (const f of inputs) h.update(relative(repoRoot, f)).update(readFileSync(f));
  return h.digest('hex').slice(0, 16);
}

/** Sequelize's own way of writing a DATE into SQLite. */
const sqlDate = (d: Date) => d.toISOString().replace('T', ' ').replace('Z', ' +00:00');

function exec(db: sqlite3.Database, sql: string) {
  return new Promise<void>((res, rej) => db.exec(sql, (err) => (err ? rej(err) : res())));
}
function all<T>(db: sqlite3.Database, sql: string) {
  return new Promise<T[]>((res, rej) => db.all(sql, (err, rows) => (err ? rej(err) : res(rows as T[]))));
}
function prepare(db: sqlite3.Database, sql: string) {
  const stmt = db.prepare(sql);
  return {
    run: (...params: unknown[]) => new Promise<void>((res, rej) => stmt.run(params, (err) => (err ? rej(err) : res()))),
    finalize: () => new Promise<void>((res) => stmt.finalize(() => res())),
  };
}

/** Seeds (or finds in the cache) a database of `sites` sites and `revisions` revisions. */
export async function ensureFleet({ sites, revisions, seed, bases, log = console.log }: { sites: number; revisions: number; seed: number; bases: BaseSite[]; log?: (s: string) => void }): Promise<Fleet> {
  const dir = join(outDir, 'fleet', fleetKey(sites, revisions, seed, bases));
  const file = join(dir, 'weir.sqlite');
  if (existsSync(join(dir, 'complete'))) return { file, sites, revisions, seconds: 0, cached: true };
  pruneFleets(join(outDir, 'fleet'), 1);
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const t0 = performance.now();

  // The server's migrations make the tables, exactly as `node dist/server.js` would.
  const database = await openDatabase(file);
  await database.close();

  const db = new sqlite3.Database(file);
  await exec(db, 'PRAGMA synchronous = OFF; PRAGMA foreign_keys = OFF;');
  const now = new Date();
  const hash = await hashPassword(BENCH_PASSWORD);
  await exec(db, 'BEGIN');
  const insertUser = prepare(db, 'INSERT INTO users (email, name, password_hash, role, disabled, token_version, created_at, updated_at) VALUES (?, ?, ?, ?, 0, 0, ?, ?)');
  for (const u of BENCH_USERS) await insertUser.run(u.email, u.name, hash, u.role, sqlDate(now), sqlDate(now));
  await insertUser.finalize();
  const users = await all<{ id: number; role: string }>(db, 'SELECT id, role FROM users');
  const installers = users.filter((u) => u.role === 'installer').map((u) => u.id);
  const leads = users.filter((u) => u.role === 'lead').map((u) => u.id);

  const insertSite = prepare(db, 'INSERT INTO sites (id, name, status, latest_state, approved_revision_id, latest_revision_id, error_count, warning_count, updated_by_id, created_at, updated_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)');
  const insertRevision = prepare(db, 'INSERT INTO revisions (id, site_id, number, yaml, sha256, document, findings, summary, error_count, warning_count, info_count, author_id, message, parent_id, state, decided_at, decided_by_id, created_at) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)');
  const insertReview = prepare(db, 'INSERT INTO reviews (revision_id, reviewer_id, decision, comment, created_at) VALUES (?, ?, ?, ?, ?)');

  const generated = generateSites(sites, seed, bases);
  const counts = revisionCounts(sites, revisions, createRng(seed));
  let revisionId = 0;
  const start = Date.UTC(2025, 0, 1);
  for (const [i, g] of generated.entries()) {
    const rng = createRng(seed * 31 + i);
    const count = counts[i];

    const check = checkSite(g.text);
    if (!check.site) throw new Error(`generated file ${g.file} failed the schema`);
    const name = check.site.site.name;
    // Two texts per site that differ in the name (so the diff has something) and in a trailing
    // comment per revision (so every revision has its own sha256); findings stay the same.
    const renamed = { ...check.site, site: { ...check.site.site, name: `${name} (extended)` } };
    const document = [JSON.stringify(check.site), JSON.stringify(renamed)];
    const texts = [g.text, g.text.replace(`name: ${name}`, `name: ${name} (extended)`)];
    const findings = JSON.stringify(check.findings);
    const summary = check.summary ? JSON.stringify(check.summary) : null;

    let approvedId: number | null = null;
    // Histories start anywhere in a year and last days to months, so the newest changes are a mix.
    let at = start + rng.int(0, 365 * 24) * 3_600_000;
    const firstAt = at;
    let state = 'pending';
    // Who changed the site last, and when: the author of a pending revision, else its reviewer.
    let lastActor = installers[0];
    let lastAt = at;
    for (let n = 1; n <= count; n++) {
      revisionId++;
      at += rng.int(1, 72) * 3_600_000;
      const author = rng.chance(0.85) ? rng.pick(installers) : rng.pick(leads);
      const last = n === count;
      const roll = rng.next();
      state = last ? (roll < 0.4 ? 'pending' : roll < 0.75 ? 'approved' : 'returned') : roll < 0.5 ? 'superseded' : roll < 0.8 ? 'approved' : 'returned';
      // As the server has it: a revision with an error finding cannot be approved.
      if (state === 'approved' && check.counts.error > 0) state = 'returned';
      const decided = state === 'approved' || state === 'returned';
      const decidedAt = state === 'pending' ? null : sqlDate(new Date(at + 3_600_000));
      const reviewer = leads.find((l) => l !== author) ?? leads[0];
      const text = `${texts[n % 2]}# bench revision ${n}\n`;
      await insertRevision.run(
        revisionId, g.id, n, text, createHash('sha256').update(text).digest('hex'), document[n % 2], findings, summary,
        check.counts.error, check.counts.warning, check.counts.info, author, `bench revision ${n}`, approvedId, state,
        decidedAt, decided ? reviewer : null, sqlDate(new Date(at)),
      );
      if (decided) await insertReview.run(revisionId, reviewer, state === 'approved' ? 'approve' : 'return', state === 'returned' ? 'the CT leads need re-measuring' : null, decidedAt);
      if (state === 'approved') approvedId = revisionId;
      lastActor = decided ? reviewer : author;
      lastAt = decided ? at + 3_600_000 : at;
    }
    const latestState = state as 'pending' | 'approved' | 'returned';
    await insertSite.run(
      g.id, name, deriveSiteStatus(latestState, approvedId), latestState, approvedId, revisionId,
      check.counts.error, check.counts.warning, lastActor, sqlDate(new Date(firstAt)), sqlDate(new Date(lastAt)),
    );
  }
  await Promise.all([insertSite.finalize(), insertRevision.finalize(), insertReview.finalize()]);
  await exec(db, 'COMMIT');
  // No ANALYZE: the server never runs it, so the query plans stay the ones it would get.
  await exec(db, 'PRAGMA wal_checkpoint(TRUNCATE)');
  await new Promise<void>((res, rej) => db.close((err) => (err ? rej(err) : res())));
  const seconds = (performance.now() - t0) / 1000;
  log(`seeded ${sites} sites and ${revisions} revisions in ${seconds.toFixed(1)} s (${(statSync(file).size / 1e6).toFixed(0)} MB)`);
  mkdirSync(join(dir, 'complete'));
  return { file, sites, revisions, seconds, cached: false };
}

/** A full-size fleet is most of a gigabyte: keep only the `keep` newest (say the quick one) besides the one being made. */
function pruneFleets(root: string, keep: number) {
  if (!existsSync(root)) return;
  const dirs = readdirSync(root).map((name) => join(root, name)).sort((a, b) => statSync(b).mtimeMs - statSync(a).mtimeMs);
  for (const d of dirs.slice(keep)) rmSync(d, { recursive: true, force: true });
}

/** Revisions per site: around the mean, 1 to 2×mean−1, in pairs, so that the total is exact. */
function revisionCounts(sites: number, revisions: number, rng: ReturnType<typeof createRng>): number[] {
  const mean = Math.floor(revisions / sites);
  if (mean < 1) throw new Error('a fleet needs at least one revision per site');
  const counts = new Array<number>(sites).fill(mean);
  for (let i = 0; i + 1 < sites; i += 2) {
    const d = rng.int(0, mean - 1);
    counts[i] += d;
    counts[i + 1] -= d;
  }
  counts[sites - 1] += revisions - mean * sites;
  return counts;
}

/** A fresh, writable copy of the fleet's database in `dataDir` (as WEIR_DATA_DIR expects it). */
export function copyFleet(fleet: Fleet, dataDir: string): string {
  rmSync(dataDir, { recursive: true, force: true });
  mkdirSync(dataDir, { recursive: true });
  const target = join(dataDir, 'weir.sqlite');
  copyFileSync(fleet.file, target);
  return target;
}
