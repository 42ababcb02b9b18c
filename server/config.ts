import { randomBytes } from 'node:crypto';
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** The documented demo password, used when WEIR_DEMO_PASSWORD is unset. */
export const DEFAULT_DEMO_PASSWORD = 'weir-demo-2026';

export interface Config {
  port: number;
  host: string;
  dataDir: string;
  databaseFile: string;
  uploadsDir: string;
  outboxDir: string;
  jwtSecret: string;
  /** Token lifetime, seconds. */
  jwtTtlS: number;
  smtpUrl: string | null;
  mailFrom: string;
  /** How long pushes are gathered into one awaiting-review message per lead. */
  mailDigestMs: number;
  /** Base of the links in e-mails. */
  publicUrl: string;
  demoPassword: string;
  demoPasswordFromEnv: boolean;
  /** Failed logins allowed per client address and window. */
  loginRateLimit: number;
  loginRateWindowMs: number;
  logLevel: string;
  /** Express `trust proxy` setting, for the client address behind a reverse proxy. */
  trustProxy: boolean | number | string;
  /** The built reviewer (`dist/web`); null to serve the API alone. */
  webDir: string | null;
}

export class ConfigError extends Error {}

export const databaseFileOf = (dataDir: string) => path.join(dataDir, 'weir.sqlite');

/** The address to show for a listening host: a wildcard host is reached on the loopback. */
export const displayHost = (host: string) => (host === '0.0.0.0' || host === '::' ? '127.0.0.1' : host);

function integer(env: NodeJS.ProcessEnv, name: string, fallback: number, min: number, max: number): number {
  const raw = env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < min || n > max) throw new ConfigError(`${name} must be a whole number from ${min} to ${max}, not "${raw}"`);
  return n;
}

function trustProxy(raw: string | undefined): Config['trustProxy'] {
  if (raw === undefined || raw === '' || raw === 'false') return false;
  if (raw === 'true') return true;
  return /^\d+$/.test(raw) ? Number(raw) : raw;
}

/**
 * The secret that signs tokens: JWT_SECRET, or one generated on first start and kept in the
 * data folder (mode 0600), so tokens survive a restart. Replicas must share JWT_SECRET.
 */
export function loadJwtSecret(env: NodeJS.ProcessEnv, dataDir: string): string {
  if (env.JWT_SECRET) {
    if (env.JWT_SECRET.length < 32) throw new ConfigError('JWT_SECRET must be at least 32 characters long');
    return env.JWT_SECRET;
  }
  const file = path.join(dataDir, 'jwt-secret');
  try {
    return readFileSync(file, 'utf8').trim();
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') throw err;
  }
  mkdirSync(dataDir, { recursive: true });
  const secret = randomBytes(48).toString('base64url');
  try {
    // `wx`: if another process created it meanwhile, use theirs.
    writeFileSync(file, `${secret}\n`, { flag: 'wx', mode: 0o600 });
    return secret;
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code === 'EEXIST') return readFileSync(file, 'utf8').trim();
    throw err;
  }
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const dataDir = path.resolve(overrides.dataDir ?? env.WEIR_DATA_DIR ?? './var');
  const port = overrides.port ?? integer(env, 'PORT', 3000, 0, 65535);
  const host = overrides.host ?? (env.HOST || '127.0.0.1');
  return {
    port,
    host,
    dataDir,
    databaseFile: databaseFileOf(dataDir),
    uploadsDir: path.join(dataDir, 'uploads'),
    outboxDir: path.join(dataDir, 'outbox'),
    jwtSecret: overrides.jwtSecret ?? loadJwtSecret(env, dataDir),
    // 8 hours: one working day per sign-in.
    jwtTtlS: integer(env, 'WEIR_TOKEN_TTL_S', 8 * 3600, 60, 30 * 24 * 3600),
    smtpUrl: env.SMTP_URL || null,
    mailFrom: env.WEIR_MAIL_FROM || 'Weir <weir@example.test>',
    mailDigestMs: integer(env, 'WEIR_MAIL_DIGEST_S', 2, 0, 3600) * 1000,
    publicUrl: (env.WEIR_PUBLIC_URL || `http://${displayHost(host)}:${port}`).replace(/\/+$/, ''),
    demoPassword: env.WEIR_DEMO_PASSWORD || DEFAULT_DEMO_PASSWORD,
    demoPasswordFromEnv: Boolean(env.WEIR_DEMO_PASSWORD),
    loginRateLimit: integer(env, 'WEIR_LOGIN_RATE_LIMIT', 10, 1, 1_000_000),
    loginRateWindowMs: integer(env, 'WEIR_LOGIN_RATE_WINDOW_S', 15 * 60, 1, 24 * 3600) * 1000,
    logLevel: env.WEIR_LOG_LEVEL || 'info',
    trustProxy: trustProxy(env.WEIR_TRUST_PROXY),
    webDir: null,
    ...overrides,
  };
}
