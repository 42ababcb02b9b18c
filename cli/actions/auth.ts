// `weir login`, `weir logout`, `weir whoami`.
import { readFileSync } from 'node:fs';
import inquirer from 'inquirer';
import { createApiClient, normaliseServer } from '../lib/api-client.ts';
import type { User } from '../lib/api-types.ts';
import { createColour } from '../lib/colour.ts';
import { credentialsPath, deleteCredentials, readCredentials, writeCredentials } from '../lib/credentials.ts';
import { ApiError, CliError } from '../lib/errors.ts';
import { openSession, resolveServer } from '../lib/session.ts';

export const DEFAULT_SERVER = 'http://localhost:3000';

const out = (line: string) => process.stdout.write(`${line}\n`);

export interface LoginOptions {
  server?: string;
  email?: string;
  password?: string;
  passwordStdin?: boolean;
  color?: boolean;
}

function needTerminal(what: string, flag: string): never {
  throw new CliError(`no ${what} given, and no terminal to ask in`, 2, `give ${flag}`);
}

export async function runLogin(options: LoginOptions): Promise<void> {
  const c = createColour(process.stdout, options);
  const saved = readCredentials();
  const interactive = process.stdin.isTTY === true && !options.passwordStdin;
  let server = resolveServer(options.server, saved);
  if (!server) {
    if (!interactive) needTerminal('server', '--server <url> or WEIR_SERVER');
    server = normaliseServer((await inquirer.prompt([{
      type: 'input', name: 'server', message: 'Server', default: DEFAULT_SERVER,
      validate: (v: string) => { try { normaliseServer(v); return true; } catch (err) { return (err as Error).message; } },
    }])).server);
  }
  let email = options.email?.trim();
  if (!email) {
    if (!interactive) needTerminal('e-mail address', '--email <address>');
    email = ((await inquirer.prompt([{
      type: 'input', name: 'email', message: 'E-mail', default: saved?.email || undefined,
      validate: (v: string) => /^[^\s@]+@[^\s@]+$/.test(v.trim()) || 'an e-mail address, such as name@example.test',
    }])).email as string).trim();
  }
  let password = options.password;
  if (options.passwordStdin) {
    try {
      password = readFileSync(0, 'utf8').replace(/\r?\n$/, '');
    } catch (err) {
      throw new CliError(`cannot read the password from stdin: ${(err as Error).message}`);
    }
  }
  if (!password) {
    if (!interactive) needTerminal('password', '--password-stdin (or --password)');
    password = (await inquirer.prompt([{ type: 'password', name: 'password', message: 'Password', mask: '*', validate: (v: string) => v.length > 0 || 'the password' }])).password as string;
  }

  const client = createApiClient(server);
  let answer: { token: string; user: User };
  try {
    answer = await client.post<{ token: string; user: User }>('/api/auth/login', { email, password });
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) throw new CliError(`${server} did not accept that e-mail and password`);
    throw err;
  }
  const file = writeCredentials({ server, token: answer.token, email: answer.user.email });
  out(`${c.green('Signed in')} to ${c.bold(server)} as ${answer.user.name} <${answer.user.email}> (${answer.user.role}).`);
  out(c.dim(`The token is saved in ${file}, readable by you only.`));
  if (process.env.WEIR_TOKEN) out(c.yellow('Note: WEIR_TOKEN is set in this shell and is used instead of the saved token.'));
}

export async function runLogout(options: { color?: boolean }): Promise<void> {
  const c = createColour(process.stdout, options);
  const saved = readCredentials();
  if (deleteCredentials()) out(`${c.green('Signed out')} of ${saved?.server ?? 'the server'} (removed ${credentialsPath()}).`);
  else out('Not signed in: there is no saved sign-in to remove.');
  if (process.env.WEIR_TOKEN) out(c.yellow('Note: WEIR_TOKEN is still set in this shell; unset it to stop using it.'));
}

export async function runWhoami(options: { server?: string; format?: string; color?: boolean }): Promise<void> {
  const session = openSession(options);
  const { user } = await session.client.get<{ user: User }>('/api/me');
  if (options.format === 'json') {
    out(JSON.stringify({ server: session.server, tokenFrom: session.tokenFrom, user }, null, 2));
    return;
  }
  const c = createColour(process.stdout, options);
  out(`${c.bold(user.name)} <${user.email}>, ${user.role}, on ${session.server} ${c.dim(`(token from ${session.tokenFrom})`)}`);
}
