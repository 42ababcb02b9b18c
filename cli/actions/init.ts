// `weir init`: the safety cautions, the questions (or flags), then a commented site file that
// passes `weir check`.
import { existsSync, mkdirSync, realpathSync } from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import inquirer from 'inquirer';
import { checkSite, SAFETY_CAUTIONS } from '../../shared/index.ts';
import { createColour } from '../lib/colour.ts';
import { CliError, EXIT_FINDINGS } from '../lib/errors.ts';
import { buildSite, SITE_ID_PATTERN, TO_BE_CONFIRMED, type FieldKey, type SomeAnswers } from '../lib/init-fields.ts';
import { QUESTIONS } from '../lib/init-flags.ts';
import { gatherAnswers } from '../lib/init-prompts.ts';
import { renderSiteYaml } from '../lib/init-yaml.ts';
import { fileBlock, plural } from '../lib/print-findings.ts';
import { writeFileAtomic } from '../lib/write-atomic.ts';

const SCHEMA_FILE = path.join('schemas', 'site.schema.json');
/** Where editors find the schema when no copy is near: its $id. */
const SCHEMA_ID = 'https://weir.example.test/schemas/site.schema.json';

const posix = (p: string) => p.split(path.sep).join('/');

/** The nearest schemas/site.schema.json at or above the file's folder, else the one shipped with weir. */
export function schemaRefFor(folder: string): string {
  for (let dir = path.resolve(folder); ; dir = path.dirname(dir)) {
    if (existsSync(path.join(dir, SCHEMA_FILE))) return posix(path.relative(folder, path.join(dir, SCHEMA_FILE)));
    if (path.dirname(dir) === dir) break;
  }
  try {
    const shipped = path.join(path.dirname(realpathSync(process.argv[1])), '..', SCHEMA_FILE);
    // Outside the project (the walk above found no schema): the copy shipped with weir, as a URL.
    if (existsSync(shipped)) return pathToFileURL(shipped).href;
  } catch {
    // no launcher path: fall through to the schema's $id
  }
  return SCHEMA_ID;
}

function writeNew(target: string, text: string, force: boolean): void {
  if (!force && existsSync(target)) throw new CliError(`${target} already exists; give --force to overwrite it`);
  mkdirSync(path.dirname(path.resolve(target)), { recursive: true });
  writeFileAtomic(target, text);
}

export async function runInit(file: string | undefined, options: Record<string, unknown>, global: { color?: boolean }): Promise<void> {
  const c = createColour(process.stdout, global);
  const e = createColour(process.stderr, global);
  const out = (line: string) => process.stdout.write(`${line}\n`);
  const yes = options.yes === true;
  const force = options.force === true;

  // The cautions come first, whatever else happens; on stderr so that scripts can keep stdout.
  process.stderr.write(`${e.bold.yellow('Safety first')}\n${SAFETY_CAUTIONS.map((s) => `  ${e.yellow('!')} ${s}`).join('\n')}\n\n`);

  if (file !== undefined && !force && existsSync(file)) throw new CliError(`${file} already exists; give --force to overwrite it`);

  const flags: Partial<Record<FieldKey, string>> = {};
  for (const key of Object.keys(QUESTIONS) as FieldKey[]) {
    const v = options[key];
    if (typeof v === 'string') flags[key] = v;
  }
  const defaults: SomeAnswers = {};
  if (file !== undefined) {
    const stem = path.basename(file).replace(/\.ya?ml$/i, '');
    if (SITE_ID_PATTERN.test(stem)) defaults.siteId = stem;
  }
  const folder = file !== undefined ? path.dirname(file) : '.';
  const schemaRef = typeof options.schema === 'string' ? options.schema : schemaRefFor(folder);

  if (!yes) out(c.dim('Answer each question, or press Enter for the default in brackets. Ctrl-C stops without writing.'));
  const answers = await gatherAnswers({
    flags, generation: options.generation as string[] | undefined, yes, defaults, schemaRef, c, out,
  });

  const target = file ?? `${answers.siteId}.yaml`;
  const text = renderSiteYaml(buildSite(answers), { schemaRef });
  const result = checkSite(text);
  const shown = posix(target);
  if (result.counts.error > 0) {
    out('');
    out(fileBlock(shown, result.findings.filter((f) => f.severity === 'error'), c));
    let write = false;
    if (!yes) {
      write = (await inquirer.prompt([{ type: 'confirm', name: 'write', message: `The site has ${plural(result.counts.error, 'error')}. Write it anyway?`, default: false }])).write;
    }
    if (!write) {
      process.exitCode = EXIT_FINDINGS;
      out(`${c.red('Nothing written:')} the answers make a site with ${plural(result.counts.error, 'error')}.`);
      return;
    }
  }
  writeNew(target, text, force);
  const others = result.findings.filter((f) => f.severity !== 'error');
  out('');
  if (others.length) out(fileBlock(shown, others, c));
  out(`${c.green('Wrote')} ${c.bold(shown)} (${plural(result.counts.error, 'error')}, ${plural(result.counts.warning, 'warning')}, ${plural(result.counts.info, 'info')}).`);
  const placeholders = text.split('\n').filter((l) => l.includes(`: ${TO_BE_CONFIRMED}`)).length;
  const fill = placeholders ? `fill in the ${plural(placeholders, 'value')} marked "${TO_BE_CONFIRMED}", then ` : '';
  out(`Next: ${fill}${c.bold(`weir check ${shown}`)}, then ${c.bold(`weir push ${shown}`)} to send it for review.`);
}
