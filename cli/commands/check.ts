import { Command } from 'commander';
import { formatOption } from './options.ts';

export function checkCommand(): Command {
  return new Command('check')
    .description('check site files offline with the same rules as the server')
    .argument('[paths...]', 'site files, folders (searched for *.yaml and *.yml) or globs; default: the current folder')
    .addOption(formatOption(['human', 'json', 'sarif']))
    .option('--explain', 'also show the summary figures of each site (JSON: as `figures`)')
    .option('--cache', 'reuse the results of earlier checks of the very same text; see below')
    .addHelpText('after', `
Output
  human  one line per finding, \`file:line:col: severity rule-id message\`, then a summary
  json   one document: { files: [{ path, site, findings: [{ ruleId, severity, message, path,
         line, column, source?, hint? }] }], summary: { files, errors, warnings, infos } }
         \`site\` is the file's site id (site.id), or null when the file has none;
         \`path\` is the file as given, relative to the current folder
  sarif  SARIF 2.1.0 for CI annotations

Cache (off unless --cache is given; WEIR_NO_CACHE=1 turns it off again)
  Results are kept in $XDG_CACHE_HOME/weir (default ~/.cache/weir), keyed by each file's exact
  text and the engine build, so a second check reads only the files that changed.

Exit status
  0  no error findings (warnings and infos do not fail)
  1  at least one error finding, including YAML and schema errors
  2  usage or I/O problem: an unreadable path, or no files matched`)
    .action(async (paths: string[], options: { format: 'human' | 'json' | 'sarif'; explain?: boolean; cache?: boolean }, command: Command) => {
      const { runCheck } = await import('../actions/check.ts');
      await runCheck(paths, { ...options, color: command.optsWithGlobals().color });
    });
}
