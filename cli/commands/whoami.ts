import { Command } from 'commander';
import { formatOption } from './options.ts';

export function whoamiCommand(): Command {
  return new Command('whoami')
    .description('show who you are signed in as, and on which server')
    .addOption(formatOption())
    .action(async (options: { format: string }, cmd: Command) => {
      const { runWhoami } = await import('../actions/auth.ts');
      await runWhoami({ ...cmd.optsWithGlobals(), ...options });
    });
}
