import { Command } from 'commander';
import { formatOption } from './options.ts';

export function diffCommand(): Command {
  return new Command('diff')
    .description("show, field by field, how a local site file differs from its site's approved revision")
    .argument('<file>', 'the site file')
    .option('--exit-code', 'exit 1 when there are differences')
    .addOption(formatOption())
    .action(async (file: string, options: Record<string, unknown>, cmd: Command) => {
      const { runDiff } = await import('../actions/diff.ts');
      await runDiff(file, { ...cmd.optsWithGlobals(), ...options });
    });
}
