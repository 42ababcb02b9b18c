// Direct access to a Weir database file with the sqlite3 package, behind the application's back:
// to count what is stored, to check the file's integrity, and to tamper with the change log.
import sqlite3 from 'sqlite3';

function open(file: string, mode: number): Promise<sqlite3.Database> {
  return new Promise((resolve, reject) => {
    const db = new sqlite3.Database(file, mode, (err) => (err ? reject(err) : resolve(db)));
  });
}

const close = (db: sqlite3.Database) => new Promise<void>((resolve, reject) => db.close((err) => (err ? reject(err) : resolve())));

export async function query<T = Record<string, unknown>>(file: string, sql: string, params: unknown[] = []): Promise<T[]> {
  const db = await open(file, sqlite3.OPEN_READONLY);
  try {
    db.configure('busyTimeout', 10_000);
    return await new Promise<T[]>((resolve, reject) => db.all(sql, params, (err, rows) => (err ? reject(err) : resolve(rows as T[]))));
  } finally {
    await close(db);
  }
}

/** Runs statements as one transaction on a read-write connection. */
export async function exec(file: string, sql: string): Promise<void> {
  const db = await open(file, sqlite3.OPEN_READWRITE);
  try {
    db.configure('busyTimeout', 10_000);
    await new Promise<void>((resolve, reject) => db.exec(`BEGIN IMMEDIATE; ${sql}; COMMIT;`, (err) => (err ? reject(err) : resolve())));
  } finally {
    await close(db);
  }
}

/** `PRAGMA integrity_check`: the one row "ok" when the file is sound. */
export async function integrityCheck(file: string): Promise<string[]> {
  const rows = await query<{ integrity_check: string }>(file, 'PRAGMA integrity_check');
  return rows.map((r) => r.integrity_check);
}

export const STATE_TABLES = ['users', 'sites', 'revisions', 'reviews', 'attachments', 'audit_events'] as const;

/**
 * How many rows each table holds. Failed sign-ins are left out of the change log's count: they
 * are state changes that must be logged (the documented exception to "nothing is stored").
 */
export async function stateCounts(file: string): Promise<Record<string, number>> {
  const out: Record<string, number> = {};
  for (const table of STATE_TABLES) {
    const where = table === 'audit_events' ? " WHERE action <> 'auth.login-failed'" : '';
    const [row] = await query<{ n: number }>(file, `SELECT COUNT(*) AS n FROM ${table}${where}`);
    out[table] = row.n;
  }
  return out;
}
