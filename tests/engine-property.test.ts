// Property tests: whatever text arrives (a half-typed file, a binary upload, a hostile YAML), the
// engine answers with findings and never throws. Every finding is well formed: integer line and
// column from 1, a known severity, and a rule id that is `schema`, `yaml-syntax` or one of RULES.
import { readFileSync, readdirSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { stringify } from 'yaml';
import { RULES, checkSite, parseSite, runRules, type Finding, type Site } from '../shared/index.ts';
import { validateSite } from '../shared/site/site-validator.generated.js';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite } from '../shared/test-support/base-site.ts';

const examplesDir = fileURLToPath(new URL('../examples/', import.meta.url));
const EXAMPLES = readdirSync(examplesDir).filter((f) => f.endsWith('.yaml')).sort().map((f) => readFileSync(`${examplesDir}${f}`, 'utf8'));
const KNOWN_IDS = new Set(['schema', 'yaml-syntax', ...RULES.map((r) => r.id)]);
const SEVERITIES = new Set(['error', 'warning', 'info']);
// Keep the whole file within about 20 s on a shared 2-core machine.
const RUNS = { numRuns: 150 };

function assertWellFormed(findings: readonly Finding[]): void {
  for (const f of findings) {
    if (!Number.isInteger(f.line) || f.line < 1) throw new Error(`bad line ${f.line} in ${JSON.stringify(f)}`);
    if (!Number.isInteger(f.column) || f.column < 1) throw new Error(`bad column ${f.column} in ${JSON.stringify(f)}`);
    if (!SEVERITIES.has(f.severity)) throw new Error(`bad severity in ${JSON.stringify(f)}`);
    if (!KNOWN_IDS.has(f.ruleId)) throw new Error(`unknown rule id in ${JSON.stringify(f)}`);
    if (typeof f.message !== 'string' || f.message.length === 0) throw new Error(`empty message in ${JSON.stringify(f)}`);
    if (typeof f.path !== 'string') throw new Error(`bad path in ${JSON.stringify(f)}`);
    // A rule that threw is reported as "internal error": that is a bug in a rule, never a site's fault.
    if (/internal error/.test(f.message)) throw new Error(`a rule threw: ${f.message}`);
  }
}

/** Runs the three entry points on `text` and checks what they give. Throws on any failure. */
function checkAll(text: string): void {
  const parsed = parseSite(text);
  assertWellFormed(parsed.findings);
  const check = checkSite(text);
  assertWellFormed(check.findings);
  const counted = { error: 0, warning: 0, info: 0 };
  for (const f of check.findings) counted[f.severity]++;
  expect(check.counts).toEqual(counted);
  if (parsed.site) {
    assertWellFormed(runRules(parsed.site, parsed.locate));
    assertWellFormed(runRules(parsed.site));
  } else {
    // rules run only on a file that passed the schema; a file that did not pass has a finding why
    expect(check.findings.some((f) => f.severity === 'error' && (f.ruleId === 'schema' || f.ruleId === 'yaml-syntax'))).toBe(true);
  }
}

/** A double as YAML would write it: `.nan`, `.inf`, `-.inf`, or the number. */
const yamlNumber = (d: number) => (Number.isNaN(d) ? '.nan' : d === Infinity ? '.inf' : d === -Infinity ? '-.inf' : String(d));

const lineMutation = fc.oneof(
  fc.record({ kind: fc.constant('delete' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('duplicate' as const), at: fc.nat() }),
  fc.record({ kind: fc.constant('number' as const), at: fc.nat(), value: fc.oneof(fc.double(), fc.integer(), fc.constantFrom(0, -0, -1, 1e308, -1e308, 5e-324, 2 ** 53 + 1)), raw: fc.boolean() }),
  fc.record({ kind: fc.constant('string' as const), at: fc.nat(), value: fc.string({ maxLength: 20 }), quoted: fc.boolean() }),
);

type Mutation = { kind: 'delete' | 'duplicate' | 'number' | 'string'; at: number; value?: unknown; raw?: boolean; quoted?: boolean };

function mutate(text: string, m: Mutation): string {
  const lines = text.split('\n');
  switch (m.kind) {
    case 'delete': {
      lines.splice(m.at % lines.length, 1);
      return lines.join('\n');
    }
    case 'duplicate': {
      const i = m.at % lines.length;
      lines.splice(i, 0, lines[i]);
      return lines.join('\n');
    }
    case 'number': {
      const numbers = [...text.matchAll(/-?\d+(?:\.\d+)?/g)];
      if (numbers.length === 0) return text;
      const n = numbers[m.at % numbers.length];
      const value = m.raw ? String(m.value) : yamlNumber(m.value as number); // raw: `NaN`, `Infinity` as plain strings
      return text.slice(0, n.index) + value + text.slice(n.index! + n[0].length);
    }
    default: {
      const values = [...text.matchAll(/: ([^\s{[#][^,}\n]*)/g)];
      if (values.length === 0) return text;
      const v = values[m.at % values.length];
      const replacement = m.quoted ? JSON.stringify(m.value) : String(m.value);
      const start = v.index! + 2;
      return text.slice(0, start) + replacement + text.slice(start + v[1].length);
    }
  }
}

describe('the engine never throws', () => {
  it('on random strings', () => {
    fc.assert(fc.property(fc.string({ unit: 'binary', maxLength: 400 }), (text) => { checkAll(text); }), RUNS);
  });

  it('on random strings made of YAML punctuation', () => {
    const yamlish = fc.string({ unit: fc.constantFrom(':', ' ', '\n', '-', '[', ']', '{', '}', ',', '&', '*', '!', '|', '>', '#', '"', "'", '?', 'a', '1', '\t', '%', '@', '`'), maxLength: 200 });
    fc.assert(fc.property(yamlish, (text) => { checkAll(text); }), RUNS);
  });

  it('on random bytes decoded as UTF-8', () => {
    const decoder = new TextDecoder('utf-8');
    fc.assert(fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => { checkAll(decoder.decode(bytes)); }), RUNS);
  });

  it('on random JSON-ish values dumped as YAML', () => {
    fc.assert(fc.property(fc.jsonValue({ maxDepth: 6 }), (value) => { checkAll(stringify(value)); }), RUNS);
  });

  it('on random objects with site keys dumped as YAML', () => {
    const keys = fc.constantFrom('weir', 'site', 'agreement', 'service', 'meter', 'cts', 'gateway', 'generation', 'export', 'commissioning', 'id', 'limitKw', 'phase');
    const value = fc.letrec((tie) => ({
      node: fc.oneof({ depthSize: 'small' }, fc.jsonValue({ maxDepth: 1 }), fc.dictionary(keys, tie('node'), { maxKeys: 5 }), fc.array(tie('node'), { maxLength: 3 })),
    })).node;
    fc.assert(fc.property(fc.dictionary(keys, value, { maxKeys: 10 }), (obj) => { checkAll(stringify(obj)); }), { numRuns: 100 });
  });

  it('on mutations of the example files (line deleted or duplicated, a number or a value replaced)', () => {
    fc.assert(fc.property(fc.constantFrom(...EXAMPLES), fc.array(lineMutation, { minLength: 1, maxLength: 3 }), (text, mutations) => {
      let out = text;
      for (const m of mutations) out = mutate(out, m);
      checkAll(out);
    }), { numRuns: 300 });
  });

  it('runRules, on schema-valid sites whose numbers are extreme', () => {
    // Replace numbers in a clean site with random doubles; keep what the schema accepts (rules only
    // ever see such sites) and run every rule on it.
    const paths: ((s: Site, v: number) => void)[] = [
      (s, v) => { s.agreement.exportLimitKw = v; },
      (s, v) => { s.export.limitKw = v; },
      (s, v) => { s.service.voltageLn = v; },
      (s, v) => { s.service.voltageLl = v; },
      (s, v) => { s.service.mainBreakerA = v; },
      (s, v) => { s.cts[0].ratedPrimaryA = v; },
      (s, v) => { s.cts[0].ratedBurdenVa = v; },
      (s, v) => { if (s.cts[0].lead) s.cts[0].lead.csaMm2 = v; },
      (s, v) => { if (s.cts[0].lead) s.cts[0].lead.lengthM = v; },
      (s, v) => { s.meter.modbus.address = v; },
      (s, v) => { s.gateway.bus.lengthM = v; },
      (s, v) => { s.gateway.bus.devices = v; },
      (s, v) => { s.generation[0].unitAcKw = v; },
      (s, v) => { s.generation[0].units = v; },
      (s, v) => { s.export.failSafe.afterS = v; },
      (s, v) => { const r = s.commissioning?.readings?.[0]; if (r?.L1) r.L1.v = v; },
      (s, v) => { const r = s.commissioning?.readings?.[0]; if (r?.L1) r.L1.a = v; },
      (s, v) => { const r = s.commissioning?.readings?.[0]; if (r?.L1) r.L1.kw = v; },
      (s, v) => { const r = s.commissioning?.readings?.[0]; if (r?.L1) r.L1.kvar = v; },
      (s, v) => { if (s.commissioning?.exportTest) s.commissioning.exportTest.observedMaxKw = v; },
    ];
    // The schema caps quantities at physical maxima, so most extreme values are refused before the
    // rules: draw mostly from the accepted range, and its edges, to reach the rules often.
    const number = fc.oneof(
      { arbitrary: fc.double({ min: 0, max: 1e5, noNaN: true }), weight: 4 },
      { arbitrary: fc.constantFrom(0, 5e-324, 1e-9, 1, 86_400, 1e5, 1e6, 2 ** 31), weight: 2 },
      { arbitrary: fc.double({ noNaN: true, noDefaultInfinity: true }), weight: 1 },
      { arbitrary: fc.integer(), weight: 1 },
    );
    const bases = [baseThreePhaseSite, baseSinglePhaseSite, baseSplitPhaseSite];
    let ran = 0;
    fc.assert(fc.property(fc.nat({ max: bases.length - 1 }), fc.array(fc.tuple(fc.nat({ max: paths.length - 1 }), number), { minLength: 1, maxLength: 6 }), (b, changes) => {
      const site = bases[b]();
      for (const [p, v] of changes) paths[p](site, v);
      if (!validateSite(site)) return;
      ran++;
      assertWellFormed(runRules(site));
      checkAll(stringify(site));
    }), { numRuns: 300 });
    expect(ran).toBeGreaterThan(50);
  });
});

describe('hostile YAML', () => {
  const DEPTH = 20_000;
  it.each([
    ['nested flow sequences', '['.repeat(DEPTH) + ']'.repeat(DEPTH)],
    ['nested flow mappings', '{a: '.repeat(DEPTH) + '1' + '}'.repeat(DEPTH)],
    ['nested block sequences', '- '.repeat(DEPTH) + 'x'],
    ['nested block mappings under a key', `weir: 1\nsite:\n${Array.from({ length: 2000 }, (_, i) => `${' '.repeat(i + 1)}k${i}:`).join('\n')} 1`],
    ['a deep value inside a site file', EXAMPLES[0].replace('address: 7 Quarry Row', `address: ${'['.repeat(DEPTH)}${']'.repeat(DEPTH)}`)],
  ])('%s, 20 000 levels deep, gives a finding', (_name, text) => {
    const started = Date.now();
    checkAll(text);
    expect(checkSite(text).findings.length).toBeGreaterThan(0);
    expect(Date.now() - started).toBeLessThan(5000);
  });

  it('a self-referencing alias `a: &a [*a]` gives findings, not a loop', () => {
    checkAll('a: &a [*a, *a, *a]\n');
    checkAll(EXAMPLES[0].replace('  address: 7 Quarry Row', '  address: &a [*a]'));
  });

  it('a billion-laughs alias bomb is refused quickly', () => {
    const levels = ['a: &a ["lol","lol","lol","lol","lol","lol","lol","lol","lol"]'];
    for (let i = 1; i < 10; i++) {
      const prev = String.fromCharCode(96 + i);
      const name = String.fromCharCode(97 + i);
      levels.push(`${name}: &${name} [${Array(9).fill(`*${prev}`).join(',')}]`);
    }
    const text = levels.join('\n') + '\n';
    const started = Date.now();
    const check = checkSite(text);
    checkAll(text);
    expect(check.findings.some((f) => f.ruleId === 'yaml-syntax' && f.severity === 'error')).toBe(true);
    expect(Date.now() - started).toBeLessThan(5000);
  });

  it('an alias bomb hidden inside a real site file is refused', () => {
    const bomb = 'x0: &x0 [1,1,1,1,1,1,1,1,1,1]\n' + Array.from({ length: 8 }, (_, i) => `x${i + 1}: &x${i + 1} [${Array(10).fill(`*x${i}`).join(',')}]`).join('\n');
    const text = EXAMPLES[0].replace('weir: 1', `weir: 1\n${bomb}`);
    const check = checkSite(text);
    checkAll(text);
    expect(check.site).toBeNull();
    expect(check.findings.some((f) => f.severity === 'error')).toBe(true);
  });

  it('a long line, a huge number and many keys do not hurt', () => {
    checkAll(`weir: 1\nsite: ${'x'.repeat(200_000)}\n`);
    checkAll(EXAMPLES[0].replace('limitKw: 3.68\n  failSafe', `limitKw: 1${'0'.repeat(400)}\n  failSafe`));
    checkAll(Array.from({ length: 5000 }, (_, i) => `k${i}: ${i}`).join('\n'));
  });
});
