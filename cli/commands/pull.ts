import { Command } from 'commander';

export function pullCommand(): Command {
  return new Command('pull')
    .description("write a site's approved site file")
    .argument('<site-id>', 'the site id')
    .option('-o, --output <file>', 'where to write it; - for stdout (default: <site-id>.yaml)')
    .option('--latest', 'the latest revision, whatever its state, instead of the approved one')
    .option('--force', 'overwrite a file that differs')
    .action(async (siteId: string, options: Record<string, unknown>, cmd: Command) => {
      const { runPull } = await import('../actions/pull.ts');
      await runPull(siteId, { ...cmd.optsWithGlobals(), ...options });
    });
}
