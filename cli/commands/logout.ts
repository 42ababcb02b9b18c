import { Command } from 'commander';

export function logoutCommand(): Command {
  return new Command('logout')
    .description('forget the saved sign-in')
    .action(async (_options: unknown, cmd: Command) => {
      const { runLogout } = await import('../actions/auth.ts');
      await runLogout(cmd.optsWithGlobals());
    });
}
