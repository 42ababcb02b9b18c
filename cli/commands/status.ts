import { Command } from 'commander';
import { formatOption } from './options.ts';

export function statusCommand(): Command {
  return new Command('status')
    .description("show each local file's site on the server: latest revision, its state, and whether the file differs from the approved one")
    .argument('[paths...]', 'site files, folders or globs; default: the current folder')
    .addOption(formatOption())
    .action(async (paths: string[], options: Record<string, unknown>, cmd: Command) => {
      const { runStatus } = await import('../actions/status.ts');
      await runStatus(paths, { ...cmd.optsWithGlobals(), ...options });
    });
}
