import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { RULES, runRules } from './run-rules.ts';
import { baseThreePhaseSite, mutated } from '../test-support/base-site.ts';

/**
 * Every rule id of rules.md (version 1) with its severity and the area (table) it sits in, copied
 * from the tables of rules.md. The ids are the public interface of `weir check --format json`.
 */
const RULES_MD: ReadonlyArray<readonly [area: string, id: string, severity: 'error' | 'warning' | 'info']> = [
  ['service', 'service-voltage-ratio', 'error'],
  ['service', 'service-voltage-nonstandard', 'warning'],
  ['export', 'export-limit-over-agreement', 'error'],
  ['export', 'export-limit-over-service', 'error'],
  ['export', 'export-control-disabled', 'error'],
  ['export', 'export-control-unneeded', 'info'],
  ['export', 'export-per-phase-incomplete', 'error'],
  ['export', 'failsafe-too-slow', 'error'],
  ['meter', 'meter-position-feeder', 'error'],
  ['meter', 'meter-voltage-wiring', 'error'],
  ['meter', 'meter-ct-missing', 'error'],
  ['meter', 'meter-ct-unknown', 'error'],
  ['meter', 'meter-ct-phase-pair', 'error'],
  ['cts', 'ct-undersized', 'error'],
  ['cts', 'ct-mixed-ratio', 'error'],
  ['cts', 'ct-low-accuracy-at-limit', 'warning'],
  ['cts', 'ct-burden-exceeded', 'error'],
  ['cts', 'ct-arrow-toward-grid', 'warning'],
  ['bus', 'modbus-address', 'error'],
  ['bus', 'modbus-baud', 'error'],
  ['bus', 'modbus-framing', 'warning'],
  ['bus', 'bus-baud-mismatch', 'error'],
  ['bus', 'bus-too-long', 'warning'], // "warning above 1000 m, error above 1200 m"
  ['bus', 'bus-stub-too-long', 'warning'],
  ['bus', 'bus-termination', 'warning'],
  ['bus', 'bus-device-count', 'error'],
  ['generation', 'generation-phase-invalid', 'error'],
  ['generation', 'phase-imbalance', 'error'],
  ['commissioning', 'reading-voltage-missing', 'error'],
  ['commissioning', 'reading-ct-reversed', 'error'],
  ['commissioning', 'reading-cross-phase', 'error'], // a warning when only |PF| is known
  ['commissioning', 'export-test-failed', 'error'],
  ['commissioning', 'failsafe-test-failed', 'error'],
  ['commissioning', 'commissioning-missing', 'info'],
];

describe('RULES', () => {
  it('holds exactly the rules of rules.md, in its order, with its severities', () => {
    expect(RULES.map((r) => [r.id, r.severity])).toEqual(RULES_MD.map(([, id, severity]) => [id, severity]));
  });

  it('every rule has a title', () => {
    for (const rule of RULES) expect(rule.title.length, rule.id).toBeGreaterThan(0);
  });

  it.each([...new Set(RULES_MD.map(([area]) => area))])('shared/rules/%s.test.ts tests every rule id of its area', (area) => {
    const text = readFileSync(fileURLToPath(new URL(`./${area}.test.ts`, import.meta.url)), 'utf8');
    for (const [a, id] of RULES_MD) {
      if (a === area) expect(text, `${area}.test.ts should describe ${id}`).toContain(`describe('${id}'`);
    }
  });
});

describe('runRules', () => {
  it('places every finding at 1:1 without a locator, with a path and the rule\'s source', () => {
    const site = mutated(baseThreePhaseSite(), (s) => { s.meter.modbus.address = 0; });
    const [finding] = runRules(site);
    expect(finding).toMatchObject({
      ruleId: 'modbus-address', severity: 'error', path: 'meter.modbus.address', line: 1, column: 1,
      source: expect.stringContaining('Modbus over Serial Line V1.02 §2.2'),
    });
  });

  it('asks the locator for each finding\'s path segments', () => {
    const asked: (string | number)[][] = [];
    const site = mutated(baseThreePhaseSite(), (s) => { s.cts[2].arrow = 'toward-grid'; });
    const findings = runRules(site, (segments) => { asked.push([...segments]); return { line: 40, column: 12 }; });
    expect(asked).toContainEqual(['cts', 2, 'arrow']);
    expect(findings[0]).toMatchObject({ ruleId: 'ct-arrow-toward-grid', line: 40, column: 12 });
  });

  it('gives nothing on the clean base site', () => {
    expect(runRules(baseThreePhaseSite())).toEqual([]);
  });
});
