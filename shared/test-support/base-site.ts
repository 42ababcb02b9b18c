// Test support only: clean base sites that the rule tests mutate one field at a time.
// Pure data (no fs), so it obeys the same rule as the rest of shared/. The figures are invented
// for tests, chosen so that every base site gives no finding at all.
import { runRules } from '../rules/run-rules.ts';
import { validateSite } from '../site/site-validator.generated.js';
import type { Finding, Site } from '../site/types.ts';

/** Three-phase 4-wire 230/400 V 50 Hz, aggregate 10 kW limit, gb-g100, fully commissioned. */
export function baseThreePhaseSite(): Site {
  return {
    weir: 1,
    site: { id: 'test-three-phase', name: 'Test three-phase site', address: '1 Test Row' },
    agreement: { reference: 'TEST-3P-1', exportLimitKw: 10, profile: 'gb-g100' },
    service: { arrangement: 'three-phase-4w', voltageLn: 230, voltageLl: 400, frequencyHz: 50, mainBreakerA: 100 },
    meter: {
      serial: 'TEST-M-3P',
      position: 'grid-connection',
      modbus: { address: 1, baud: 9600, parity: 'even', stopBits: 1 },
      voltageInputs: { V1: 'L1', V2: 'L2', V3: 'L3', N: 'N' },
      currentInputs: {
        I1: { ct: 'ct-1', conductor: 'L1' },
        I2: { ct: 'ct-2', conductor: 'L2' },
        I3: { ct: 'ct-3', conductor: 'L3' },
      },
    },
    cts: [1, 2, 3].map((n) => ({
      id: `ct-${n}`,
      ratedPrimaryA: 100,
      secondary: '5A' as const,
      accuracyClass: '1' as const,
      ratedBurdenVa: 2.5,
      lead: { lengthM: 4, csaMm2: 2.5 },
      arrow: 'toward-load' as const,
    })),
    gateway: {
      serial: 'TEST-GW-3P',
      bus: { lengthM: 25, baud: 9600, terminations: ['gateway', 'meter'], stubs: [{ device: 'meter', lengthM: 0.5 }], devices: 2 },
    },
    generation: [
      { id: 'roof-l1', units: 10, unitAcKw: 0.4, phase: 'L1' },
      { id: 'roof-l2', units: 10, unitAcKw: 0.4, phase: 'L2' },
      { id: 'roof-l3', units: 10, unitAcKw: 0.4, phase: 'L3' },
    ],
    export: { control: 'enabled', scope: 'aggregate', limitKw: 10, failSafe: { action: 'curtail-to-limit', afterS: 5 } },
    commissioning: {
      date: '2026-11-20',
      readings: [
        {
          label: 'loads-on-generation-off',
          expect: 'import',
          L1: { v: 231, a: 12.1, kw: 2.62 },
          L2: { v: 229, a: 8.0, kw: 1.75 },
          L3: { v: 232, a: 5.2, kw: 1.15 },
        },
        {
          label: 'loads-off-generation-on',
          expect: 'export',
          L1: { v: 233, a: 15.0, kw: -3.4 },
          L2: { v: 232, a: 15.2, kw: -3.45 },
          L3: { v: 234, a: 14.8, kw: -3.38 },
        },
      ],
      exportTest: { observedMaxKw: 9.8, settleS: 8 },
      failSafeTest: { observedS: 4 },
    },
  };
}

/** Single-phase 230 V 50 Hz, 3.68 kW limit, gb-g100, commissioned. */
export function baseSinglePhaseSite(): Site {
  const site = baseThreePhaseSite();
  site.site = { id: 'test-single-phase', name: 'Test single-phase site' };
  site.agreement = { reference: 'TEST-1P-1', exportLimitKw: 3.68, profile: 'gb-g100' };
  site.service = { arrangement: 'single-phase', voltageLn: 230, frequencyHz: 50, mainBreakerA: 80 };
  site.meter.voltageInputs = { V1: 'L1', N: 'N' };
  site.meter.currentInputs = { I1: { ct: 'ct-1', conductor: 'L1' } };
  site.cts = [site.cts[0]];
  site.generation = [{ id: 'roof', units: 12, unitAcKw: 0.4, phase: 'L1' }];
  site.export = { control: 'enabled', scope: 'aggregate', limitKw: 3.68, failSafe: { action: 'curtail-to-limit', afterS: 5 } };
  site.commissioning = {
    date: '2026-11-21',
    readings: [
      { label: 'loads-on-generation-off', expect: 'import', L1: { v: 231, a: 12.1, kw: 2.62 } },
      { label: 'loads-off-generation-on', expect: 'export', L1: { v: 233, a: 15.0, kw: -3.4 } },
    ],
    exportTest: { observedMaxKw: 3.6, settleS: 6 },
    failSafeTest: { observedS: 4 },
  };
  return site;
}

/** Split-phase 120/240 V 60 Hz, 5 kW limit, us-pcs (its null imbalance limit gives one info). */
export function baseSplitPhaseSite(): Site {
  const site = baseThreePhaseSite();
  site.site = { id: 'test-split-phase', name: 'Test split-phase site' };
  site.agreement = { reference: 'TEST-SP-1', exportLimitKw: 5, profile: 'us-pcs' };
  site.service = { arrangement: 'split-phase', voltageLn: 120, voltageLl: 240, frequencyHz: 60, mainBreakerA: 200 };
  site.meter.voltageInputs = { V1: 'L1', V2: 'L2', N: 'N' };
  site.meter.currentInputs = { I1: { ct: 'ct-1', conductor: 'L1' }, I2: { ct: 'ct-2', conductor: 'L2' } };
  site.cts = [1, 2].map((n) => ({ id: `ct-${n}`, ratedPrimaryA: 200, secondary: '333mV' as const, accuracyClass: '0.5' as const, arrow: 'toward-load' as const }));
  site.generation = [{ id: 'roof', units: 20, unitAcKw: 0.384, phase: 'all' }];
  site.export = { control: 'enabled', scope: 'aggregate', limitKw: 5, failSafe: { action: 'curtail-to-limit', afterS: 20 } };
  site.commissioning = {
    date: '2026-11-22',
    readings: [
      { label: 'loads-on-generation-off', expect: 'import', L1: { v: 121, a: 18.0, kw: 2.1 }, L2: { v: 119, a: 12.0, kw: 1.36 } },
    ],
    exportTest: { observedMaxKw: 5.2, settleS: 12 },
    failSafeTest: { observedS: 18 },
  };
  return site;
}

/** A deep copy of `site` changed by `mutate`, so a test never leaks into the next. */
export function mutated(site: Site, mutate: (s: Site) => void): Site {
  const copy = structuredClone(site);
  mutate(copy);
  return copy;
}

/**
 * The findings of one rule on `site`. Rules only ever run on a file that passed the schema, so a
 * fixture that the schema rejects is a broken test: it throws rather than test the impossible.
 */
export function ruleFindings(site: Site, ruleId: string): Finding[] {
  if (!validateSite(site)) {
    const errors = (validateSite as unknown as { errors?: { instancePath: string; message?: string }[] }).errors ?? [];
    throw new Error(`test fixture fails the schema: ${errors.map((e) => `${e.instancePath} ${e.message}`).join('; ')}`);
  }
  return runRules(site).filter((f) => f.ruleId === ruleId);
}

/** `ruleId (severity)` of every finding, sorted: a compact thing to compare in a test. */
export function ruleSummary(findings: readonly Finding[]): string[] {
  return findings.map((f) => `${f.ruleId} (${f.severity})`).sort();
}
