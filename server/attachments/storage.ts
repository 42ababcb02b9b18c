import { randomBytes } from 'node:crypto';
import { createReadStream } from 'node:fs';
import { mkdir, rename, stat, unlink, writeFile } from 'node:fs/promises';
import path from 'node:path';
import type { Readable } from 'node:stream';

/**
 * Where uploaded files live, by content hash. The local folder is the one store today; an
 * S3-compatible store (the AWS SDK's PutObject / GetObject) fits the same three calls.
 */
export interface BlobStorage {
  /** Stores `data` under `key`; a key that exists already is left as it is (same hash, same bytes). */
  put(key: string, data: Buffer): Promise<void>;
  get(key: string): Promise<Readable>;
  has(key: string): Promise<boolean>;
}

const KEY = /^[0-9a-f]{64}$/;

/** Files under `<root>/<first two hex digits>/<hash>`, written to a temporary name and renamed. */
export function createLocalStorage(root: string): BlobStorage {
  const fileOf = (key: string) => {
    if (!KEY.test(key)) throw new Error(`not a content hash: ${key}`);
    return path.join(root, key.slice(0, 2), key);
  };
  const has = async (key: string) => {
    try {
      return (await stat(fileOf(key))).isFile();
    } catch {
      return false;
    }
  };
  return {
    has,
    async put(key, data) {
      if (await has(key)) return;
      const file = fileOf(key);
      await mkdir(path.dirname(file), { recursive: true });
      const temp = `${file}.${randomBytes(6).toString('hex')}.part`;
      try {
        await writeFile(temp, data, { flag: 'wx' });
        await rename(temp, file);
      } catch (err) {
        await unlink(temp).catch(() => undefined);
        throw err;
      }
    },
    async get(key) {
      const file = fileOf(key);
      await stat(file);
      return createReadStream(file);
    },
  };
}
