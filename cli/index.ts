// The weir CLI. This file and cli/commands/* hold only command definitions; each action imports
// its heavy modules (yaml, the engine, chalk, inquirer) when it runs, so `weir --version` and
// `weir --help` start about as fast as Node itself.
import { Command, CommanderError } from 'commander';
import { auditCommand } from './commands/audit.ts';
import { checkCommand } from './commands/check.ts';
import { diffCommand } from './commands/diff.ts';
import { initCommand } from './commands/init.ts';
import { logCommand } from './commands/log.ts';
import { loginCommand } from './commands/login.ts';
import { logoutCommand } from './commands/logout.ts';
import { pullCommand } from './commands/pull.ts';
import { pushCommand } from './commands/push.ts';
import { statusCommand } from './commands/status.ts';
import { whoamiCommand } from './commands/whoami.ts';
import { EXIT_USAGE } from './lib/errors.ts';
import { VERSION } from './lib/version.ts';

function buildProgram(): Command {
  const program = new Command('weir')
    .description('Check, push and follow the export-limit set-up of solar sites, kept as reviewed site files.')
    .version(VERSION, '-v, --version', 'print the version')
    .option('--server <url>', 'the Weir server (default: WEIR_SERVER, else the one you signed in to)')
    .option('--no-color', 'no colour (also when NO_COLOR is set or the output is not a terminal)')
    .showHelpAfterError('(run with --help for usage)')
    .addHelpText('after', `
Offline:   check, init
Server:    login, logout, whoami, push, status, diff, pull, log, audit verify
Scripts:   WEIR_SERVER and WEIR_TOKEN take the place of \`weir login\`.
Exit status: 0 fine, 1 errors in a site file (or refused by the server), 2 usage, I/O or set-up trouble.`);
  for (const command of [checkCommand(), initCommand(), loginCommand(), logoutCommand(), whoamiCommand(), pushCommand(), statusCommand(), diffCommand(), pullCommand(), logCommand(), auditCommand()]) {
    program.addCommand(command);
  }
  // Commander's own exits become exceptions, so that one place sets the exit code.
  const configure = (cmd: Command) => {
    cmd.exitOverride();
    cmd.configureHelp({ showGlobalOptions: true });
    for (const sub of cmd.commands) configure(sub);
  };
  configure(program);
  return program;
}

async function main(): Promise<void> {
  // `weir check | head`: a reader that goes away is not an error of ours.
  for (const stream of [process.stdout, process.stderr]) {
    stream.on('error', (err: NodeJS.ErrnoException) => {
      if (err.code === 'EPIPE') process.exit(process.exitCode ?? 0);
      throw err;
    });
  }
  try {
    await buildProgram().parseAsync(process.argv);
  } catch (err) {
    if (err instanceof CommanderError) {
      // Help and version end with code 0; a usage error's message is already printed.
      process.exitCode = err.exitCode === 0 ? 0 : EXIT_USAGE;
      return;
    }
    const { reportError } = await import('./lib/report-error.ts');
    process.exitCode = reportError(err);
  }
}

await main();
