import { renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { CliError } from './errors.ts';

/**
 * Writes `text` to a temporary file beside `target` and renames it into place: an interrupted
 * write never leaves a half-written site file, and an old file stays whole until the rename.
 */
export function writeFileAtomic(target: string, text: string): void {
  const temp = path.join(path.dirname(path.resolve(target)), `.${path.basename(target)}.${process.pid}.tmp`);
  try {
    writeFileSync(temp, text, { flag: 'wx' });
    renameSync(temp, target);
  } catch (err) {
    rmSync(temp, { force: true });
    // The temporary file's name would only puzzle: say what is wrong with the target.
    const why = (err as NodeJS.ErrnoException).code === 'ENOENT' ? `the folder ${path.dirname(target)} does not exist` : (err as Error).message;
    throw new CliError(`cannot write ${target}: ${why}`);
  }
}
