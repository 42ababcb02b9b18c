// The weir CLI. This file and cli/commands/* hold only command definitions; each action imports
// its heavy modules (yaml, the engine, chalk, inquirer) when it runs, so `weir --version` and
// `weir --help` start as fast as Node itself.
import { Command, CommanderError } from 'commander';
import { checkCommand } from './commands/check.ts';
import { initCommand } from './commands/init.ts';
import { EXIT_USAGE } from './lib/errors.ts';
import { VERSION } from './lib/version.ts';

function buildProgram(): Command {
  const program = new Command('weir')
    .description('Check, push and follow the export-limit set-up of solar sites, kept as reviewed site files.')
    .version(VERSION, '-v, --version', 'print the version')
    .option('--no-color', 'no colour in the output (also NO_COLOR=1, and whenever the output is not a terminal)')
    .showHelpAfterError('(run with --help for usage)');
  program.addCommand(checkCommand());
  program.addCommand(initCommand());
  // Commander's own exits become exceptions, so that one place sets the exit code.
  const configure = (cmd: Command) => {
    cmd.exitOverride();
    for (const sub of cmd.commands) configure(sub);
  };
  configure(program);
  return program;
}

async function main(): Promise<void> {
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
