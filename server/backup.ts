import { randomBytes } from 'node:crypto';
import { existsSync } from 'node:fs';
import { mkdir, open, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import sqlite3 from 'sqlite3';

/** Writes a file's (or folder's) data to the disk before it takes the name asked for. */
async function fsyncPath(file: string) {
  const handle = await open(file, 'r');
  try {
    await handle.sync();
  } finally {
    await handle.close();
  }
}

/** The part of sqlite3's Backup object used here (its type declarations leave it out). */
interface SqliteBackup {
  step(pages: number, callback: (err: Error | null) => void): void;
  finish(callback?: (err: Error | null) => void): void;
  completed: boolean;
  failed: boolean;
}

/**
 * SQLite's online backup API (sqlite3_backup_init/step/finish, through the sqlite3 package's
 * `Database#backup`): all pages in one step, so the copy is one consistent snapshot while the
 * server keeps writing in WAL mode.
 */
function onlineBackup(db: sqlite3.Database, target: string): Promise<void> {
  return new Promise((resolve, reject) => {
    const backupOf = (db as unknown as { backup(file: string, cb: (err: Error | null) => void): SqliteBackup }).backup.bind(db);
    const backup = backupOf(target, (openErr) => {
      if (openErr) return reject(openErr);
      backup.step(-1, (stepErr) => {
        if (stepErr || !backup.completed) {
          backup.finish(() => reject(stepErr ?? new Error('the backup did not complete')));
          return;
        }
        backup.finish((finishErr) => (finishErr ? reject(finishErr) : resolve()));
      });
    });
  });
}

/** The copy carries the live file's WAL flag; switch it back so the copy is one file on its own. */
async function selfContained(file: string): Promise<void> {
  const copy = await new Promise<sqlite3.Database>((resolve, reject) => {
    const d = new sqlite3.Database(file, sqlite3.OPEN_READWRITE, (err) => (err ? reject(err) : resolve(d)));
  });
  try {
    await new Promise<void>((resolve, reject) => copy.run('PRAGMA journal_mode = DELETE', (err) => (err ? reject(err) : resolve())));
  } finally {
    await new Promise<void>((resolve) => copy.close(() => resolve()));
  }
}

/**
 * An online copy of the database with SQLite's backup API: a consistent snapshot, so the server
 * may keep serving. The copy is
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
    await onlineBackup(db, partial);
    await selfContained(partial);
    await fsyncPath(partial);
    if (existsSync(target)) throw new Error(`${target} exists already: choose a new file name`);
    await rename(partial, target);
    await fsyncPath(path.dirname(target));
  } finally {
    await rm(partial, { force: true });
    await new Promise<void>((resolve) => db.close(() => resolve()));
  }
}
