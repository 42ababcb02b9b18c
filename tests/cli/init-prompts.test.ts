// The wizard's questions, driven in-process: inquirer is replaced by a script that types answers
// into each question's own validate function, exactly as the prompt would on Enter.
import { Chalk } from 'chalk';
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from 'vitest';

vi.mock('inquirer', () => ({ default: { prompt: vi.fn() } }));
const inquirer = (await import('inquirer')).default as unknown as { prompt: ReturnType<typeof vi.fn> };
const { gatherAnswers } = await import('../../cli/lib/init-prompts.ts');

interface Question {
  type: string;
  message: string;
  default?: unknown;
  choices?: { value: string }[];
  validate?: (v: string) => true | string;
}

/** Typed answers by question: every answer but the last must be refused by the question itself. */
let script: Record<string, unknown[]>;
let asked: string[];
let refusals: Record<string, string[]>;

function answer(q: Question): unknown {
  asked.push(q.message);
  const key = Object.keys(script).find((k) => q.message.startsWith(k));
  const queue = key ? script[key] : undefined;
  if (!queue || queue.length === 0) return q.type === 'confirm' ? q.default ?? false : q.default ?? '';
  if (q.type === 'input') {
    // The prompt calls validate on every Enter and keeps asking until it returns true.
    for (;;) {
      const typed = String(queue.shift());
      const verdict = q.validate ? q.validate(typed) : true;
      if (verdict === true) return typed;
      (refusals[q.message] ??= []).push(verdict);
      if (queue.length === 0) throw new Error(`script ran out of answers for "${q.message}" after: ${verdict}`);
    }
  }
  return queue.shift();
}

const quiet = { c: new Chalk({ level: 0 }), out: () => undefined, schemaRef: '../schemas/site.schema.json' };
const wasTty = process.stdin.isTTY;
beforeAll(() => { (process.stdin as { isTTY?: boolean }).isTTY = true; });
afterAll(() => { (process.stdin as { isTTY?: boolean }).isTTY = wasTty; });
beforeEach(() => {
  script = {};
  asked = [];
  refusals = {};
  inquirer.prompt.mockReset();
  inquirer.prompt.mockImplementation(async ([q]: Question[]) => ({ value: answer(q) }));
});

describe('the init wizard', () => {
  it('refuses a Modbus address of 0 (broadcast) and 248 (reserved) at the prompt, then takes 7', async () => {
    // Modbus over Serial Line V1.02 §2.2: 0 broadcast, 1-247 devices, 248-255 reserved
    script = { 'Meter Modbus address': ['0', '248', 'seven', '7'] };
    const answers = await gatherAnswers({ flags: {}, yes: false, ...quiet });
    expect(answers.modbusAddress).toBe(7);
    const said = refusals['Meter Modbus address (1-247)'];
    expect(said).toHaveLength(3);
    expect(said[0]).toMatch(/broadcast/);
    expect(said[1]).toMatch(/reserved/);
    expect(said[2]).toMatch(/whole number/);
  });

  it('refuses a CT smaller than the main breaker, in the rule\'s own words', async () => {
    // ct-undersized (common practice): rated primary at least the main breaker's rating
    script = { 'Main breaker rating': ['100'], 'CT rated primary current': ['80', '100'] };
    const answers = await gatherAnswers({ flags: {}, yes: false, ...quiet });
    expect(answers.ctRated).toBe(100);
    expect(refusals['CT rated primary current, A'][0]).toContain('less than the 100 A main breaker');
  });

  it('asks no question whose flag was given', async () => {
    const answers = await gatherAnswers({ flags: { modbusAddress: '9', siteId: 'flagged-site', arrangement: 'single-phase' }, yes: false, ...quiet });
    expect(answers.modbusAddress).toBe(9);
    expect(answers.siteId).toBe('flagged-site');
    expect(asked.some((m) => m.startsWith('Meter Modbus address'))).toBe(false);
    expect(asked.some((m) => m.startsWith('Site id'))).toBe(false);
    // a single-phase service has no line-to-line voltage to ask for
    expect(asked.some((m) => m.startsWith('Line-to-line voltage'))).toBe(false);
  });

  it('asks for the generation group by group, and again when the groups are unbalanced', async () => {
    // gb-g100 allows 3.68 kVA between phases (16 A × 230 V, from memory): 4 kVA on L1 alone is over
    script = {
      'Group 1: id': ['roof', 'roof-a'],
      'Group 1: number of inverters': ['10', '5'],
      'Group 1: AC rating': ['0.4', '0.4'],
      'Group 1: phase': ['L1', 'L1'],
      'Group 2: id': ['roof-a', 'roof-b'],
      'Group 2: number of inverters': ['0', '5'],
      'Group 2: AC rating': ['0.4'],
      'Group 2: phase': ['L2'],
      'Add another generation group?': [false, true, false],
    };
    const answers = await gatherAnswers({ flags: {}, yes: false, ...quiet });
    expect(answers.generation).toEqual([
      { id: 'roof-a', units: 5, unitAcKw: 0.4, phase: 'L1' },
      { id: 'roof-b', units: 5, unitAcKw: 0.4, phase: 'L2' },
    ]);
    expect(refusals['Group 2: id'][0]).toContain('already a group roof-a');
    expect(refusals['Group 2: number of inverters'][0]).toContain('at least 1');
    expect(asked.filter((m) => m === 'Group 1: id')).toHaveLength(2); // asked again after the imbalance
  });

  it('asks the per-phase limits only for a per-phase policy, and judges their sum at the last phase', async () => {
    script = {
      'Agreed export limit': ['6'],
      'Limit scope': ['per-phase'],
      'Export limit the gateway enforces': ['6'],
      'Export limit on L1': ['2'],
      'Export limit on L2': ['2'],
      'Export limit on L3': ['3', '2'],
    };
    const answers = await gatherAnswers({ flags: {}, yes: false, ...quiet });
    expect([answers.limitL1, answers.limitL2, answers.limitL3]).toEqual([2, 2, 2]);
    expect(refusals['Export limit on L3, kW'][0]).toContain('add up to 7 kW');
  });
});
