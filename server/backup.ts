import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import path from 'node:path';
import sqlite3 from 'sqlite3';

/**
 * An online copy of the database with `VACUUM INTO`: a consistent snapshot taken inside one read
 * transaction, so the server may keep serving (in WAL mode it does not even wait).
 */
export async function backupDatabase(databaseFile: string, target: string): Promise<void> {
  if (!existsSync(databaseFile)) throw new Error(`there is no database at ${databaseFile} (is WEIR_DATA_DIR right?)`);
  if (existsSync(target)) throw new Error(`${target} exists already: choose a new file name`);
  await mkdir(path.dirname(target), { recursive: true });
  const db = await new Promise<sqlite3.Database>((resolve, reject) => {
    const d = new sqlite3.Database(databaseFile, sqlite3.OPEN_READWRITE, (err) => (err ? reject(err) : resolve(d)));
  });
  try {
    db.configure('busyTimeout', 10_000);
    await new Promise<void>((resolve, reject) => db.run('VACUUM INTO ?', [target], (err) => (err ? reject(err) : resolve())));
  } finally {
    await new Promise<void>((resolve) => db.close(() => resolve()));
  }
}
