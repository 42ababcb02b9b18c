import { Command } from 'commander';
import { formatOption } from './options.ts';

export function logCommand(): Command {
  return new Command('log')
    .description("list a site's revisions and their reviews, newest first")
    .argument('<site-id>', 'the site id')
    .addOption(formatOption())
    .action(async (siteId: string, options: Record<string, unknown>, cmd: Command) => {
      const { runLog } = await import('../actions/log.ts');
      await runLog(siteId, { ...cmd.optsWithGlobals(), ...options });
    });
}
