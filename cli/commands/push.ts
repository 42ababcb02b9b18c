import { Command } from 'commander';
import { formatOption } from './options.ts';

export function pushCommand(): Command {
  return new Command('push')
    .description('check site files, then send each to the server as a new revision for review')
    .argument('[paths...]', 'site files, folders or globs; default: the current folder')
    .option('-m, --message <text>', 'why the sites changed, recorded with each revision')
    .option('--strict', 'push nothing if any file has error findings')
    .option('--concurrency <n>', 'files sent at once (1-16)', '4')
    .addOption(formatOption())
    .addHelpText('after', `
Files with error findings are pushed too (unless --strict): the server records them, and such a
revision cannot be approved. Pushing a file that has not changed creates no new revision.
Exit status: 0 every file pushed; 1 a file was refused or failed (or --strict found errors);
2 usage, I/O, sign-in or connection problem.`)
    .action(async (paths: string[], options: Record<string, unknown>, cmd: Command) => {
      const { runPush } = await import('../actions/push.ts');
      await runPush(paths, { ...cmd.optsWithGlobals(), ...options });
    });
}
