// The fast reading (js-yaml) must give exactly what the careful reading (the `yaml` package)
// gives: the same data, the same findings at the same lines and columns.
import { readdirSync, readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkSite } from '../check-site.ts';
import { fastRead } from './fast-read.ts';

const examplesDir = fileURLToPath(new URL('../../examples/', import.meta.url));
const examples = readdirSync(examplesDir).filter((f) => f.endsWith('.yaml')).map((f) => ({ name: f, text: readFileSync(examplesDir + f, 'utf8') }));

function sameBothWays(text: string) {
  const fast = checkSite(text);
  const careful = checkSite(text, { careful: true });
  expect(fast.data).toEqual(careful.data);
  expect(fast.findings).toEqual(careful.findings);
}

describe('fast reading', () => {
  it('When an example is read, then the fast reading is used and agrees with the careful one', () => {
    for (const { name, text } of examples) {
      expect(fastRead(text)?.locate, name).toBeTruthy();
      sameBothWays(text);
    }
  });

  it('When a file uses anchors, tags or explicit keys, then it is left to the careful reading', () => {
    expect(fastRead('a: &x 1\nb: *x\n')).toBeNull();
    expect(fastRead('a: !!str 1\n')).toBeNull();
    expect(fastRead('? a\n: 1\n')).toBeNull();
    expect(fastRead('a: 0x1F\n')).toBeNull();
    expect(fastRead('a: 1_000\n')).toBeNull();
  });

  it('When js-yaml refuses a file (duplicate keys, bad indentation), then the careful reading reports it', () => {
    expect(fastRead('a: 1\na: 2\n')).toBeNull();
    const r = checkSite('weir: 1\nsite:\n  id: a\n  id: b\n');
    expect(r.findings[0]).toMatchObject({ ruleId: 'yaml-syntax', line: 4 });
  });

  it('When example files are mutated line by line, then both readings agree', () => {
    const lines = examples.map((e) => e.text.split('\n'));
    const replacement = fc.oneof(
      fc.constantFrom('', '  ', 'x: 1', '  - id: extra', '    lengthM: 2000', 'phase: L3', '"quoted": "v"', 'a: [1, 2', 'k: {a: 1}', '  # note'),
      fc.string({ maxLength: 12 }),
    );
    fc.assert(
      fc.property(fc.nat(lines.length - 1), fc.nat(200), fc.constantFrom('replace', 'delete', 'duplicate', 'indent'), replacement, (fileIndex, lineSeed, how, text) => {
        const copy = [...lines[fileIndex]];
        const at = lineSeed % copy.length;
        if (how === 'replace') copy[at] = text;
        else if (how === 'delete') copy.splice(at, 1);
        else if (how === 'duplicate') copy.splice(at, 0, copy[at]);
        else copy[at] = `  ${copy[at]}`;
        sameBothWays(copy.join('\n'));
      }),
      { numRuns: 300 },
    );
  });

  it('When numbers are changed to other plain forms, then both readings agree', () => {
    const base = examples[0].text;
    fc.assert(
      fc.property(fc.constantFrom('5', '5.0', '-5', '+5', '.5', '5.', '5e2', '5E-1', '.inf', '-.Inf', '.nan', 'null', '~', 'true', 'False', '"5"', "'5'", '5 # c', '1e400'), (value) => {
        sameBothWays(base.replace(/exportLimitKw: [^\n]+/, `exportLimitKw: ${value}`));
      }),
      { numRuns: 40 },
    );
  });
});
