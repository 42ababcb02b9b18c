// The saved sign-in: $XDG_CONFIG_HOME/weir/credentials.json (default ~/.config/weir), readable
// by its owner only (file 0600, folder 0700), holding { server, token, email }.
import { chmodSync, mkdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { CliError } from './errors.ts';

export interface Credentials {
  server: string;
  token: string;
  email: string;
}

/** The XDG base directory spec ignores a relative XDG_CONFIG_HOME. */
export function configFolder(env: NodeJS.ProcessEnv = process.env): string {
  const xdg = env.XDG_CONFIG_HOME;
  const base = xdg && path.isAbsolute(xdg) ? xdg : path.join(os.homedir(), '.config');
  return path.join(base, 'weir');
}

export function credentialsPath(env: NodeJS.ProcessEnv = process.env): string {
  return path.join(configFolder(env), 'credentials.json');
}

export function readCredentials(): Credentials | null {
  const file = credentialsPath();
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw new CliError(`cannot read ${file}: ${(err as Error).message}`);
  }
  try {
    const data = JSON.parse(text) as Partial<Credentials>;
    if (typeof data.server === 'string' && typeof data.token === 'string') {
      return { server: data.server, token: data.token, email: typeof data.email === 'string' ? data.email : '' };
    }
  } catch {
    // fall through
  }
  throw new CliError(`${file} is not a weir credentials file`, 2, 'run `weir logout` and `weir login` again');
}

export function writeCredentials(credentials: Credentials): string {
  const folder = configFolder();
  const file = credentialsPath();
  try {
    mkdirSync(folder, { recursive: true, mode: 0o700 });
    chmodSync(folder, 0o700);
    // Created 0600 before the token is written, then moved into place in one step.
    const temp = `${file}.${process.pid}.tmp`;
    writeFileSync(temp, `${JSON.stringify(credentials, null, 2)}\n`, { mode: 0o600, flag: 'w' });
    chmodSync(temp, 0o600);
    renameSync(temp, file);
  } catch (err) {
    throw new CliError(`cannot save the sign-in to ${file}: ${(err as Error).message}`);
  }
  return file;
}

/** True when there was a saved sign-in to remove. */
export function deleteCredentials(): boolean {
  const file = credentialsPath();
  try {
    readFileSync(file);
  } catch {
    return false;
  }
  rmSync(file, { force: true });
  return true;
}
