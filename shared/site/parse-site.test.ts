import { describe, expect, it } from 'vitest';
import { stringify } from 'yaml';
import { checkSite } from '../check-site.ts';
import { MAX_SITE_TEXT_CHARS, parseSite } from './parse-site.ts';
import { baseThreePhaseSite } from '../test-support/base-site.ts';

/** A clean three-phase site file, written out by hand so that line and column are easy to see. */
const SITE = `# yaml-language-server: $schema=../schemas/site.schema.json
weir: 1
site:
  id: parser-test-site
  name: Parser Test Site
agreement:
  reference: NOA-TEST-1
  exportLimitKw: 10
  profile: gb-g100
service:
  arrangement: three-phase-4w
  voltageLn: 230
  voltageLl: 400
  frequencyHz: 50
  mainBreakerA: 100
meter:
  serial: EM-1
  position: grid-connection
  modbus: { address: 1, baud: 9600, parity: even, stopBits: 1 }
  voltageInputs: { V1: L1, V2: L2, V3: L3, N: N }
  currentInputs:
    I1: { ct: ct-1, conductor: L1 }
    I2: { ct: ct-2, conductor: L2 }
    I3: { ct: ct-3, conductor: L3 }
cts:
  - { id: ct-1, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
  - { id: ct-2, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
  - { id: ct-3, ratedPrimaryA: 100, secondary: 333mV, accuracyClass: "1", arrow: toward-load }
gateway:
  serial: GW-1
  bus:
    lengthM: 25
    baud: 9600
    terminations: [gateway, meter]
    devices: 2
generation:
  - { id: roof, units: 30, unitAcKw: 0.4, phase: all }
export:
  control: enabled
  scope: aggregate
  limitKw: 10
  failSafe: { action: curtail-to-limit, afterS: 5 }
commissioning:
  date: 2026-11-20
  exportTest: { observedMaxKw: 9.9 }
  failSafeTest: { observedS: 4 }
`;

/** 1-based line and column of the first `needle` in `text` (after `after`, if given). */
function pos(text: string, needle: string, after = ''): { line: number; column: number } {
  const from = after ? text.indexOf(after) : 0;
  const at = text.indexOf(needle, from);
  if (at < 0 || from < 0) throw new Error(`"${needle}" not in the text`);
  const before = text.slice(0, at).split('\n');
  return { line: before.length, column: before[before.length - 1].length + 1 };
}

describe('parseSite on a good file', () => {
  it('reads the clean site with no finding at all', () => {
    const parsed = parseSite(SITE);
    expect(parsed.findings).toEqual([]);
    expect(parsed.site?.site.id).toBe('parser-test-site');
    expect(checkSite(SITE).findings).toEqual([]);
  });

  it('reads a date as a string (YAML 1.2 core schema), as the schema wants', () => {
    expect(parseSite(SITE).site?.commissioning?.date).toBe('2026-11-20');
  });
});

describe('schema findings carry 1-based line and column', () => {
  it('an enum value that is wrong points at the value', () => {
    // site-format.md: a value out of its enum is a schema error, reported at its line and column
    const text = SITE.replace('profile: gb-g100', 'profile: gb-g99');
    const findings = parseSite(text).findings;
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ ruleId: 'schema', severity: 'error', path: 'agreement.profile', ...pos(text, 'gb-g99') });
    expect(findings[0]).toMatchObject({ line: 9, column: 12 });
    expect(findings[0].message).toContain('gb-g100');
  });

  it('an enum value inside a flow mapping points at that value', () => {
    const text = SITE.replace('parity: even', 'parity: mark');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'meter.modbus.parity', ...pos(text, 'mark') });
  });

  it('a missing key points at its parent: no voltageLl on three-phase → the `service:` line', () => {
    // site-format.md: a missing required key is a schema error at its parent's line
    const text = SITE.replace('  voltageLl: 400\n', '');
    const findings = parseSite(text).findings;
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ ruleId: 'schema', severity: 'error', path: 'service.voltageLl', line: pos(text, 'service:').line });
    expect(findings[0].line).toBe(10);
    expect(findings[0].message).toContain('voltageLl');
  });

  it('a missing key in a list item points at that item\'s key line', () => {
    const text = SITE.replace(', arrow: toward-load }\n  - { id: ct-2', ' }\n  - { id: ct-2');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'cts[0].arrow' });
    expect(finding.line).toBe(pos(text, '{ id: ct-1').line);
  });

  it('a missing key inside a flow mapping points at the mapping\'s key (`modbus:`)', () => {
    const text = SITE.replace(', stopBits: 1 }', ' }');
    const findings = parseSite(text).findings;
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ ruleId: 'schema', path: 'meter.modbus.stopBits', ...pos(text, 'modbus:') });
  });

  it('a missing top-level key points at the start of the document, after the leading comment', () => {
    const text = SITE.replace('weir: 1\n', '');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'weir', line: 2, column: 1 });
  });

  it('an enum value in a block list item points at the value', () => {
    const text = SITE.replace('phase: all }', 'phase: L4 }');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'generation[0].phase', ...pos(text, 'L4') });
  });

  it('a wrong type points at the value', () => {
    const text = SITE.replace('lengthM: 25', 'lengthM: long');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'gateway.bus.lengthM', ...pos(text, 'long') });
  });

  it('an unknown key points at the key and suggests the near one', () => {
    const text = SITE.replace('mainBreakerA: 100', 'mainBreakerAmps: 100');
    const findings = parseSite(text).findings;
    // the renamed key is also a missing one, reported at `service:`
    expect(findings.map((f) => f.path).sort()).toEqual(['service.mainBreakerA', 'service.mainBreakerAmps']);
    const finding = findings.find((f) => f.path === 'service.mainBreakerAmps')!;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'service.mainBreakerAmps', ...pos(text, 'mainBreakerAmps') });
    expect(finding.hint).toContain('mainBreakerA');
  });

  it('.nan and .inf are not numbers to the schema', () => {
    for (const bad of ['.nan', '.inf', '-.inf']) {
      const text = SITE.replace('limitKw: 10\n  failSafe', `limitKw: ${bad}\n  failSafe`);
      const findings = parseSite(text).findings;
      expect(findings.map((f) => [f.ruleId, f.path]), bad).toEqual([['schema', 'export.limitKw']]);
      expect(findings[0]).toMatchObject(pos(text, bad, 'export:'));
    }
  });

  it('weir: 2 is not format 1', () => {
    const [finding] = parseSite(SITE.replace('weir: 1', 'weir: 2')).findings;
    expect(finding).toMatchObject({ ruleId: 'schema', path: 'weir', line: 2, column: 7 });
  });

  it('per-phase scope without perPhaseLimitKw is reported once, at export', () => {
    const text = SITE.replace('scope: aggregate', 'scope: per-phase');
    const findings = parseSite(text).findings;
    expect(findings.map((f) => f.path)).toEqual(['export.perPhaseLimitKw']);
    expect(findings[0].line).toBe(pos(text, 'export:').line);
  });
});

describe('YAML problems', () => {
  it('a syntax error is a yaml-syntax finding at its place', () => {
    const text = SITE.replace('  name: Parser Test Site', '  name: [Parser Test Site');
    const findings = parseSite(text).findings;
    expect(findings.length).toBeGreaterThan(0);
    expect(findings[0]).toMatchObject({ ruleId: 'yaml-syntax', severity: 'error' });
    // the flow sequence opened on line 5 is never closed: reported on or after that line
    expect(findings[0].line).toBeGreaterThanOrEqual(5);
    expect(parseSite(text).site).toBeNull();
  });

  it('a tab-indented line is a yaml-syntax finding on that line', () => {
    const text = SITE.replace('  reference: NOA-TEST-1', '\treference: NOA-TEST-1');
    const [finding] = parseSite(text).findings;
    expect(finding).toMatchObject({ ruleId: 'yaml-syntax', severity: 'error', line: 7 });
  });

  it('a duplicate key is an error at the second key', () => {
    const text = SITE.replace('  limitKw: 10\n  failSafe', '  limitKw: 10\n  limitKw: 10000\n  failSafe');
    const findings = parseSite(text).findings;
    expect(findings).toHaveLength(1);
    expect(findings[0]).toMatchObject({ ruleId: 'yaml-syntax', severity: 'error', ...pos(text, 'limitKw: 10000') });
    expect(findings[0].message).toMatch(/duplicate/i);
    expect(parseSite(text).site).toBeNull();
  });

  it('two documents in one file are an error, not a silent second site', () => {
    const findings = parseSite(`${SITE}---\n${SITE}`).findings;
    expect(findings.some((f) => f.ruleId === 'yaml-syntax' && f.severity === 'error')).toBe(true);
  });
});

describe('rule findings carry the position of what they are about', () => {
  it('export-limit-over-agreement points at export.limitKw\'s value', () => {
    const text = SITE.replace('limitKw: 10\n  failSafe', 'limitKw: 10000\n  failSafe');
    const finding = checkSite(text).findings.find((f) => f.ruleId === 'export-limit-over-agreement');
    expect(finding).toMatchObject({ path: 'export.limitKw', ...pos(text, '10000') });
    expect(finding).toMatchObject({ line: 41, column: 12 });
  });

  it('a finding on a block collection points at its key (modbus-address inside a flow map points at the value)', () => {
    const text = SITE.replace('address: 1,', 'address: 0,');
    const finding = checkSite(text).findings.find((f) => f.ruleId === 'modbus-address');
    expect(finding).toMatchObject(pos(text, '0,', 'modbus:'));
    const text2 = SITE.replace('terminations: [gateway, meter]', 'terminations: [gateway]');
    const termination = checkSite(text2).findings.find((f) => f.ruleId === 'bus-termination');
    expect(termination).toMatchObject({ line: pos(text2, 'terminations:').line });
  });

  it('findings come sorted by line', () => {
    const text = SITE.replace('address: 1,', 'address: 0,').replace('arrow: toward-load }\n  - { id: ct-2', 'arrow: toward-grid }\n  - { id: ct-2');
    const lines = checkSite(text).findings.map((f) => f.line);
    expect(lines.length).toBeGreaterThan(1);
    expect(lines).toEqual([...lines].sort((a, b) => a - b));
  });

  it('a site written by the yaml package from the base site is clean too', () => {
    expect(checkSite(stringify(baseThreePhaseSite())).findings).toEqual([]);
  });
});

describe('parseSite never throws', () => {
  const odd: [string, string][] = [
    ['empty text', ''],
    ['only a comment', '# nothing here\n'],
    ['a scalar', '42'],
    ['a string', 'hello'],
    ['a list', '- 1\n- 2\n'],
    ['null', '~'],
    ['binary-looking text', '\u0000\u0001\u0002\u00ff\ufffd\ud800PNG\r\n\u001a\n'],
    ['a BOM and CRLF', '\ufeffweir: 1\r\nsite: x\r\n'],
    ['unclosed quote', 'site: "abc'],
    ['an alias to nothing', 'a: *missing'],
    ['a tag the schema does not know', 'weir: !!binary aGVsbG8='],
    ['a custom tag', 'weir: !thing 1'],
    ['a self-referencing alias', 'a: &a [*a]'],
  ];

  it.each(odd)('%s gives findings with a position, and no site', (_name, text) => {
    const parsed = parseSite(text);
    expect(parsed.site).toBeNull();
    expect(parsed.findings.length).toBeGreaterThan(0);
    for (const f of parsed.findings) {
      expect(['schema', 'yaml-syntax']).toContain(f.ruleId);
      expect(Number.isInteger(f.line) && f.line >= 1).toBe(true);
      expect(Number.isInteger(f.column) && f.column >= 1).toBe(true);
    }
  });

  it('non-text input is one finding at 1:1', () => {
    for (const value of [undefined, null, 42, {}, Buffer.from('weir: 1')]) {
      const parsed = parseSite(value as unknown as string);
      expect(parsed.site).toBeNull();
      expect(parsed.findings).toHaveLength(1);
      expect(parsed.findings[0]).toMatchObject({ ruleId: 'yaml-syntax', line: 1, column: 1 });
    }
  });

  it('text over the size limit is refused with one finding, quickly', () => {
    const started = Date.now();
    const parsed = parseSite(`${SITE}#${'x'.repeat(MAX_SITE_TEXT_CHARS)}`);
    expect(parsed.findings).toHaveLength(1);
    expect(parsed.findings[0].message).toContain(String(MAX_SITE_TEXT_CHARS));
    expect(Date.now() - started).toBeLessThan(1000);
  });
});
