import { Command } from 'commander';

export function loginCommand(): Command {
  return new Command('login')
    .description('sign in to a Weir server and save the token for the other commands')
    .option('--email <address>', 'your e-mail address')
    .option('--password <password>', 'your password (visible to other users of this machine: prefer --password-stdin)')
    .option('--password-stdin', 'read the password from stdin')
    .addHelpText('after', `
The server comes from --server, WEIR_SERVER or the last sign-in; without one you are asked.
The token is saved in $XDG_CONFIG_HOME/weir/credentials.json (default ~/.config/weir/), mode 0600.
For scripts, WEIR_SERVER and WEIR_TOKEN take the place of a saved sign-in.`)
    .action(async (options: Record<string, unknown>, cmd: Command) => {
      const { runLogin } = await import('../actions/auth.ts');
      await runLogin({ ...cmd.optsWithGlobals(), ...options });
    });
}
