import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, open, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import sqlite3 from 'sqlite3';

/** Writes a file's (or folder's) data to the disk: SQLite does not for `VACUUM INTO`'s output. */
async function fsyncPath(file: string) {
  const handle = await open(file, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/**
 * An online copy of the database with `VACUUM INTO`: a consistent snapshot taken inside one read
 * transaction, so the server may keep serving (in WAL mode it does not even wait). The copy is
 * written under a temporary name, synced and then renamed, so a backup cut short by a crash or a
 * full disk never leaves a half-written file under the name asked for.
 */
export async function backupDatabase(databaseFile: string, target: string): Promise<void> {
  if (!existsSync(databaseFile)) throw new Error(`there is no database at ${databaseFile} (is WEIR_DATA_DIR right?)`);
  if (existsSync(target)) throw new Error(`${target} exists already: choose a new file name`);
  await mkdir(path.dirname(target), { recursive: true });
  const partial = `${target}.${randomBytes(6).toString('hex')}.partial`;
  const db = await new Promise<sqlite3.Database>((resolve, reject) => {
    const d = new sqlite3.Database(databaseFile, sqlite3.OPEN_READWRITE, (err) => (err ? reject(err) : resolve(d)));
  });
  try {
    db.configure('busyTimeout', 10_000);
    await new Promise<void>((resolve, reject) => db.run('VACUUM INTO ?', [partial], (err) => (err ? reject(err) : resolve())));
    await fsyncPath(partial);
    if (existsSync(target)) throw new Error(`${target} exists already: choose a new file name`);
    await rename(partial, target);
    await fsyncPath(path.dirname(target));
  } finally {
    await rm(partial, { force: true });
    await new Promise<void>((resolve) => db.close(() => resolve()));
  }
}
