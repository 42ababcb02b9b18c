// The questions of `weir init`, asked one by one with inquirer. A question whose flag was given
// is not asked (its value is checked the same way); with --yes, the unanswered ones take their
// defaults. See init-fields.ts for the questions and their checks.
import inquirer from 'inquirer';
import type { GenerationGroup } from '../../shared/index.ts';
import type { Colour } from './colour.ts';
import { CliError } from './errors.ts';
import {
  FIELDS, checkAnswer, checkGroupId, checkRaw, defaultGeneration, parseGroupSpec, phaseChoices,
  type Field, type FieldKey, type InitAnswers, type SomeAnswers,
} from './init-fields.ts';

export interface GatherOptions {
  /** Flag values by field key, as typed. */
  flags: Partial<Record<FieldKey, string>>;
  /** --generation specs. */
  generation?: string[];
  yes: boolean;
  /** Fixed answers that are not asked (the site id from the file name is only a default). */
  defaults?: SomeAnswers;
  schemaRef: string;
  c: Colour;
  out: (line: string) => void;
}

async function ask<T>(question: Record<string, unknown>): Promise<T> {
  const answers = await inquirer.prompt([{ ...question, name: 'value' }] as never);
  return (answers as { value: T }).value;
}

async function askField(field: Field, answers: SomeAnswers, o: GatherOptions): Promise<unknown> {
  const fallback = o.defaults?.[field.key] !== undefined ? o.defaults[field.key] : field.default(answers);
  for (;;) {
    let raw: string;
    if (field.kind === 'choice') {
      const choices = field.choices!(answers);
      raw = await ask<string>({ type: 'select', message: field.message, choices: choices.map((ch) => ({ value: ch.value, name: ch.name ?? ch.value })), default: String(fallback), loop: false });
    } else {
      raw = await ask<string>({
        type: 'input',
        message: field.message,
        default: fallback === '' ? undefined : String(fallback),
        validate: (typed: string) => {
          const result = checkRaw(field, typed, answers, o.schemaRef);
          return result.ok ? true : result.message;
        },
      });
    }
    const result = checkRaw(field, raw ?? '', answers, o.schemaRef);
    if (result.ok) {
      for (const note of result.notes) o.out(`  ${o.c.yellow('note:')} ${note}`);
      return result.value;
    }
    // A choice is checked after it is made (select prompts have no validation of their own).
    o.out(`  ${o.c.red('✗')} ${result.message}`);
  }
}

async function askGeneration(answers: SomeAnswers, o: GatherOptions): Promise<GenerationGroup[]> {
  const field = FIELDS.find((f) => f.key === 'generation')!;
  for (;;) {
    const groups: GenerationGroup[] = [];
    o.out(o.c.dim('  A group is a number of identical inverters on one phase (or multi-phase units on all).'));
    do {
      const n = groups.length + 1;
      const id = await ask<string>({ type: 'input', message: `Group ${n}: id`, default: `pv-${n}`, validate: (v: string) => checkGroupId(v.trim(), groups) });
      const units = await ask<string>({ type: 'input', message: `Group ${n}: number of inverters`, default: '10', validate: (v: string) => (/^\d+$/.test(v.trim()) && Number(v) >= 1) || 'a whole number, at least 1' });
      const kw = await ask<string>({ type: 'input', message: `Group ${n}: AC rating of one inverter, kW`, default: '0.4', validate: (v: string) => (Number(v.trim().replace(',', '.')) > 0) || 'a number of kW, more than 0' });
      const phases = phaseChoices(answers);
      const phase = await ask<string>({ type: 'select', message: `Group ${n}: phase`, choices: phases.map((p) => ({ value: p.value, name: p.name ?? p.value })), default: phases.length > 1 ? 'all' : 'L1' });
      const group = parseGroupSpec(`${id.trim()}:${units.trim()}:${kw.trim().replace(',', '.')}:${phase}`, answers, groups);
      if ('error' in group) o.out(`  ${o.c.red('✗')} ${group.error}`);
      else groups.push(group);
    } while (await ask<boolean>({ type: 'confirm', message: 'Add another generation group?', default: false }));
    const result = checkAnswer(field as Field<'generation'>, groups, answers, o.schemaRef);
    if (result.ok) {
      for (const note of result.notes) o.out(`  ${o.c.yellow('note:')} ${note}`);
      return groups;
    }
    o.out(`  ${o.c.red('✗')} ${result.message}`);
    o.out('  Enter the generation groups again.');
  }
}

function fromFlags(answers: SomeAnswers, o: GatherOptions): GenerationGroup[] {
  const field = FIELDS.find((f) => f.key === 'generation')! as Field<'generation'>;
  const groups: GenerationGroup[] = [];
  for (const spec of o.generation ?? []) {
    const group = parseGroupSpec(spec, answers, groups);
    if ('error' in group) throw new CliError(group.error);
    groups.push(group);
  }
  const result = checkAnswer(field, groups, answers, o.schemaRef);
  if (!result.ok) throw new CliError(`--generation: ${result.message}`);
  return groups;
}

/** Every answer: from its flag, its default (--yes) or the prompt, each checked as it comes. */
export async function gatherAnswers(o: GatherOptions): Promise<InitAnswers> {
  const answers: SomeAnswers = {};
  let section = '';
  for (const field of FIELDS) {
    if (field.when && !field.when(answers)) continue;
    let value: unknown;
    if (field.key === 'generation') {
      if (o.generation && o.generation.length > 0) value = fromFlags(answers, o);
      else if (o.yes) value = defaultGeneration(answers);
    } else if (o.flags[field.key] !== undefined) {
      const result = checkRaw(field, o.flags[field.key]!, answers, o.schemaRef);
      if (!result.ok) throw new CliError(`${field.flag.split(' ')[0]} ${o.flags[field.key]}: ${result.message}`);
      value = result.value;
    } else if (o.yes) {
      value = o.defaults?.[field.key] !== undefined ? o.defaults[field.key] : field.default(answers);
    }
    if (value === undefined) {
      if (!process.stdin.isTTY) {
        throw new CliError(`no answer for ${field.flag.split(' ')[0]}, and no terminal to ask in`, 2, 'to run weir init from a script, give --yes and the answers as flags (see weir init --help)');
      }
      if (field.section !== section) {
        section = field.section;
        o.out(`\n${o.c.bold.underline(section)}`);
      }
      value = field.key === 'generation' ? await askGeneration(answers, o) : await askField(field, answers, o);
    }
    (answers as Record<string, unknown>)[field.key] = value;
  }
  return answers as InitAnswers;
}
