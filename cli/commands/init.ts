import { Command } from 'commander';
import { QUESTIONS } from '../lib/init-flags.ts';

const collect = (value: string, previous: string[] = []) => [...previous, value];

export function initCommand(): Command {
  const command = new Command('init')
    .description('write a new site file, asking for the supply, meter, CTs, bus, generation and export policy')
    .argument('[file]', 'the site file to write; default: <site-id>.yaml in the current folder')
    .option('-y, --yes', 'ask nothing: take the default for every answer not given as a flag')
    .option('--force', 'overwrite the file if it exists')
    .option('--schema <ref>', 'the $schema reference written for editors; default: the nearest schemas/site.schema.json');
  for (const [key, q] of Object.entries(QUESTIONS)) {
    if (key === 'generation') continue;
    command.option(q.flag, q.message);
  }
  command.option('--generation <id:units:kW:phase>', 'a generation group, e.g. roof-east:10:0.4:L1 (repeat for more groups)', collect);
  command.addHelpText('after', `
Every question can be answered by its flag; with --yes the others take their defaults, so
  weir init --yes --site-id mill-lane --agreement-limit 5 --generation roof:12:0.4:all mill-lane.yaml
runs unattended. Each answer is checked as it is given (flags too) with the rules of \`weir check\`.
Exit status: 0 written; 1 the answers make a site with errors (nothing written); 2 usage problem,
an existing file without --force, or no terminal for the questions without --yes.`);
  return command.action(async (file: string | undefined, options: Record<string, unknown>, cmd: Command) => {
    const { runInit } = await import('../actions/init.ts');
    await runInit(file, options, { color: cmd.optsWithGlobals().color as boolean | undefined });
  });
}
