// The process entry: `node dist/server.js` serves, `… seed [--if-empty]` seeds the demo data,
// `… backup <file>` copies the database while the server may be serving.
import { existsSync } from 'node:fs';
import type { Server } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { createApp } from './app.ts';
import { checkPassword } from './auth/passwords.ts';
import { backupDatabase } from './backup.ts';
import { ConfigError, DEFAULT_DEMO_PASSWORD, databaseFileOf, displayHost, loadConfig, type Config } from './config.ts';
import { openRuntime, type Runtime } from './runtime.ts';
import { DEMO_ACCOUNTS } from './seed/demo-accounts.ts';
import { seedDemo } from './seed/seed.ts';
import { User } from './users/user.model.ts';

// dist/server.js and server/main.ts both sit one folder below the repository root.
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const USAGE = 'usage: node dist/server.js [serve] | seed [--if-empty] | backup <file>';
/** How long open requests get to finish on SIGTERM / SIGINT before the process stops anyway. */
const SHUTDOWN_GRACE_MS = 10_000;

const say = (line: string) => process.stdout.write(`${line}\n`);
const fail = (line: string, code = 1) => {
  process.stderr.write(`weir-server: ${line}\n`);
  process.exitCode = code;
};

function demoPasswordNote(config: Config) {
  return config.demoPasswordFromEnv ? 'the password in WEIR_DEMO_PASSWORD' : `the demo password "${DEFAULT_DEMO_PASSWORD}" (set WEIR_DEMO_PASSWORD to choose another)`;
}

async function seed(config: Config, ifEmpty: boolean) {
  const runtime = await openRuntime(config);
  try {
    if (ifEmpty && (await User.count()) > 0) {
      say(`The database in ${config.dataDir} has accounts already: not seeding.`);
      return;
    }
    const result = await seedDemo(runtime, { examplesDir: process.env.WEIR_EXAMPLES_DIR || path.join(root, 'examples'), password: config.demoPassword, log: say });
    for (const s of result.skipped) say(`skipped ${s.file}: ${s.reason}`);
    say(`Seeded ${result.accountsCreated} account(s) and ${result.sitesSeeded.length} site(s) into ${config.dataDir}, with ${demoPasswordNote(config)}.`);
  } finally {
    await runtime.close();
  }
}

/** The demo sign-ins, when the demo accounts exist; the password only when it still fits. */
async function demoLogins(config: Config): Promise<string[]> {
  const accounts = await User.findAll({ where: { email: DEMO_ACCOUNTS.map((a) => a.email), disabled: false }, order: [['id', 'ASC']] });
  if (!accounts.length) return [];
  const fits = await checkPassword(config.demoPassword, accounts[0].passwordHash);
  const password = fits ? (config.demoPasswordFromEnv ? '(WEIR_DEMO_PASSWORD)' : DEFAULT_DEMO_PASSWORD) : '(the password they were seeded with)';
  return ['Demo sign-ins, all with the password ' + password + ':', ...accounts.map((a) => `  ${a.role.padEnd(9)} ${a.email}`)];
}

async function serve(config: Config) {
  const runtime: Runtime = await openRuntime(config);
  const webDir = process.env.WEIR_WEB_DIR || path.join(root, 'dist', 'web');
  const app = createApp({ ...runtime, config: { ...config, webDir: existsSync(path.join(webDir, 'index.html')) ? webDir : null } });
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.port, config.host, () => resolve(s));
    s.once('error', reject);
  });
  const address = server.address();
  const port = typeof address === 'object' && address ? address.port : config.port;
  say(`Weir is serving on http://${displayHost(config.host)}:${port}`);
  if (!existsSync(path.join(webDir, 'index.html'))) say(`(no reviewer at ${webDir}: run npm run build to serve it; the API is up)`);
  for (const line of await demoLogins(config)) say(line);
  say(`Data in ${config.dataDir}; mail ${config.smtpUrl ? 'goes out over SMTP_URL' : `is kept in ${config.outboxDir}`}.`);

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) {
      // A second Ctrl-C: do not wait for slow clients.
      server.closeAllConnections();
      return;
    }
    stopping = true;
    runtime.logger.info({ signal }, 'shutting down');
    const force = setTimeout(() => server.closeAllConnections(), SHUTDOWN_GRACE_MS);
    force.unref();
    server.close(() => {
      runtime
        .close()
        .then(() => say('Weir has stopped.'))
        .catch((err: unknown) => fail(`could not close cleanly: ${(err as Error).message}`));
    });
    server.closeIdleConnections();
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

async function main(argv: string[]) {
  const { positionals, values } = parseArgs({ args: argv, allowPositionals: true, options: { 'if-empty': { type: 'boolean' }, help: { type: 'boolean', short: 'h' } } });
  const [command = 'serve', ...rest] = positionals;
  if (values.help) return say(USAGE);
  if (command === 'backup') {
    if (rest.length !== 1) return fail(`backup needs one target file\n${USAGE}`, 2);
    const source = databaseFileOf(path.resolve(process.env.WEIR_DATA_DIR ?? './var'));
    const target = path.resolve(rest[0]);
    await backupDatabase(source, target);
    say(`Backed up ${source} to ${target}. Attachments are separate files: copy the uploads folder beside it too.`);
    return;
  }
  if (rest.length || (command !== 'serve' && command !== 'seed')) return fail(USAGE, 2);
  const config = loadConfig(process.env);
  if (command === 'seed') return seed(config, values['if-empty'] === true);
  return serve(config);
}

main(process.argv.slice(2)).catch((err: unknown) => {
  const e = err as NodeJS.ErrnoException;
  if (err instanceof ConfigError) return fail(err.message, 2);
  if (e?.code === 'EADDRINUSE') return fail(`port ${process.env.PORT ?? 3000} is in use: stop the other server or set PORT`);
  if (e?.code === 'ERR_PARSE_ARGS_UNKNOWN_OPTION') return fail(`${e.message}\n${USAGE}`, 2);
  fail(process.env.WEIR_DEBUG ? (e?.stack ?? String(err)) : `${e?.message ?? String(err)} (set WEIR_DEBUG=1 for the details)`);
});
