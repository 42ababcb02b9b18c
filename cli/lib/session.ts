// Which server and token a command uses. --server and WEIR_SERVER choose the server; WEIR_TOKEN,
// or else the saved sign-in, gives the token. A saved token is only ever sent to the server it
// was issued by.
import { createApiClient, normaliseServer, type ApiClient } from './api-client.ts';
import { readCredentials, type Credentials } from './credentials.ts';
import { CliError } from './errors.ts';

export interface Session {
  server: string;
  token: string | null;
  email: string | null;
  /** Where the token came from. */
  tokenFrom: 'WEIR_TOKEN' | 'saved sign-in' | null;
  client: ApiClient;
}

export function resolveServer(flag: string | undefined, saved: Credentials | null): string | null {
  const raw = flag ?? process.env.WEIR_SERVER ?? saved?.server;
  return raw ? normaliseServer(raw) : null;
}

export function openSession(options: { server?: string }, { signedIn = true }: { signedIn?: boolean } = {}): Session {
  const saved = readCredentials();
  const server = resolveServer(options.server, saved);
  if (!server) throw new CliError('no server is set', 2, 'run `weir login`, or set WEIR_SERVER (and WEIR_TOKEN) for scripts');
  let token: string | null = null;
  let tokenFrom: Session['tokenFrom'] = null;
  let email: string | null = null;
  if (process.env.WEIR_TOKEN) {
    token = process.env.WEIR_TOKEN;
    tokenFrom = 'WEIR_TOKEN';
  } else if (saved && normaliseServer(saved.server) === server) {
    token = saved.token;
    tokenFrom = 'saved sign-in';
    email = saved.email || null;
  }
  if (signedIn && !token) throw new CliError(`not signed in to ${server}`, 2, 'run `weir login`, or set WEIR_TOKEN');
  return { server, token, email, tokenFrom, client: createApiClient(server, token ?? undefined) };
}
