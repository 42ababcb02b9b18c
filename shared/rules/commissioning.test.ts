import { describe, expect, it } from 'vitest';
import type { Expect, ProfileId, Reading, Site } from '../site/types.ts';
import { baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

/** A site whose only snapshot is `expect` with `reading` on L2 and ordinary import on L1 and L3. */
const withReading = (expect: Expect, reading: Reading, base: () => Site = baseThreePhaseSite) => mutated(base(), (s) => {
  s.commissioning!.readings = [{ label: 'test-snapshot', expect, L2: reading }];
});

/** A reading of `sKva` at angle φ: kw = S·cos φ, kvar = S·sin φ, with v·a = S. */
const atAngle = (deg: number, sKva = 2, v = 230): Reading => ({
  v,
  a: (sKva * 1000) / v,
  kw: sKva * Math.cos((deg * Math.PI) / 180),
  kvar: sKva * Math.sin((deg * Math.PI) / 180),
});

describe('reading-voltage-missing', () => {
  const missing = (site: Site) => ruleFindings(site, 'reading-voltage-missing');

  it('does not fire on readings near the nominal voltage', () => {
    expect(missing(baseThreePhaseSite())).toEqual([]);
  });

  it('230 V service: 115 V (= 0.5·V_LN) passes, 114.9 V and 0 V are errors', () => {
    // rules.md reading-voltage-missing: v < 0.5·V_LN
    expect(missing(withReading('import', { v: 115, a: 5, kw: 0.5 }))).toEqual([]);
    const found = missing(withReading('import', { v: 114.9, a: 5, kw: 0.5 }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'commissioning.readings[0].L2.v' });
    expect(missing(withReading('import', { v: 0, a: 5, kw: 0 }))).toHaveLength(1);
  });

  it('120 V split-phase service: 59 V fires, 60 V does not', () => {
    expect(missing(withReading('import', { v: 60, a: 5, kw: 0.28 }, baseSplitPhaseSite))).toEqual([]);
    expect(missing(withReading('import', { v: 59, a: 5, kw: 0.28 }, baseSplitPhaseSite))).toHaveLength(1);
  });
});

describe('reading-ct-reversed', () => {
  const reversed = (site: Site) => ruleFindings(site, 'reading-ct-reversed');

  it('does not fire when the signs match what was expected', () => {
    // site-format.md: positive kw is import, negative is export (common practice)
    expect(reversed(baseThreePhaseSite())).toEqual([]);
  });

  it('fires as an error on export (kw < 0) under `expect: import` at |PF| 0.93', () => {
    // common practice: a CT facing the wrong way inverts the power sign
    const found = reversed(withReading('import', { v: 229, a: 8.0, kw: -1.7 }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'commissioning.readings[0].L2.kw' });
  });

  it('fires on import (kw > 0) under `expect: export`', () => {
    expect(reversed(withReading('export', { v: 232, a: 15.2, kw: 3.45 }))).toHaveLength(1);
  });

  it('|PF| boundary 0.8: |PF| = 2000/(250·10) = 0.8 fires, 0.76 does not', () => {
    // rules.md reading-ct-reversed: kw < 0 with |PF| ≥ 0.8
    expect(reversed(withReading('import', { v: 250, a: 10, kw: -2 }))).toHaveLength(1);
    expect(reversed(withReading('import', { v: 250, a: 10, kw: -1.9 }))).toEqual([]);
  });

  it('never fires under `expect: any`', () => {
    expect(reversed(withReading('any', { v: 229, a: 8.0, kw: -1.7 }))).toEqual([]);
  });
});

describe('reading-cross-phase', () => {
  const cross = (site: Site) => ruleFindings(site, 'reading-cross-phase');

  it('does not fire on in-phase readings', () => {
    expect(cross(baseThreePhaseSite())).toEqual([]);
    expect(cross(withReading('import', atAngle(10)))).toEqual([]);
    // a reversed CT is 180° out, not a cross-phase error
    expect(cross(withReading('import', atAngle(180)))).toEqual([]);
  });

  it.each([120, -120, 60, -60])('is an error when φ = %i°, with kvar known', (deg) => {
    // IEEE Std 1459-2010 phasor relations; common practice: another phase's current is 120° off
    const found = cross(withReading('import', atAngle(deg)));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'commissioning.readings[0].L2' });
  });

  it('15° window: 106° and 134° fire (within 15° of 120°), 104° and 136° do not', () => {
    // rules.md reading-cross-phase: φ within 15° of ±120° or ±60°
    expect(cross(withReading('import', atAngle(106)))).toHaveLength(1);
    expect(cross(withReading('import', atAngle(134)))).toHaveLength(1);
    expect(cross(withReading('import', atAngle(104)))).toEqual([]);
    expect(cross(withReading('import', atAngle(136)))).toEqual([]);
    expect(cross(withReading('import', atAngle(-46)))).toHaveLength(1);
    expect(cross(withReading('import', atAngle(-44)))).toEqual([]);
  });

  it('warns when only |PF| is known and lies in 0.35–0.65 (cos 60° = 0.5)', () => {
    // rules.md reading-cross-phase: warning if only |PF| is known and lies in 0.35–0.65 (common practice)
    const found = cross(withReading('import', { v: 200, a: 10, kw: 1 }));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('warning');
    expect(cross(withReading('import', { v: 200, a: 10, kw: 0.7 }))).toHaveLength(1); // |PF| 0.35
    expect(cross(withReading('import', { v: 200, a: 10, kw: 1.3 }))).toHaveLength(1); // |PF| 0.65
    expect(cross(withReading('import', { v: 200, a: 10, kw: 0.6 }))).toEqual([]); // |PF| 0.3
    expect(cross(withReading('import', { v: 200, a: 10, kw: 1.4 }))).toEqual([]); // |PF| 0.7
  });

  it('does not guess from |PF| when kvar gives the angle', () => {
    // |PF| 0.5 but φ = atan2(-0.05, 1) ≈ −3°: in phase, a light load with a poor power factor is not flagged
    expect(cross(withReading('import', { v: 200, a: 10, kw: 1, kvar: -0.05 }))).toEqual([]);
  });
});

describe('export-test-failed', () => {
  const failed = (profile: ProfileId, observedMaxKw: number) => ruleFindings(mutated(baseThreePhaseSite(), (s) => {
    s.agreement.profile = profile;
    s.commissioning!.exportTest = { observedMaxKw };
  }), 'export-test-failed');

  it('gb-g100 has no tolerance: 10 kW on a 10 kW limit passes, 10.05 kW is an error', () => {
    // ENA EREC G100 Issue 2: the limit applies at the exit point (secondary source); exportTolerance 0
    expect(failed('gb-g100', 10)).toEqual([]);
    const found = failed('gb-g100', 10.05);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'commissioning.exportTest.observedMaxKw' });
  });

  it('us-pcs allows 110 %: 11 kW on 10 kW passes, 11.1 kW fails', () => {
    // UL 1741 PCS requirement decision: inadvertent export ≤ 110 % of the limit (secondary source)
    expect(failed('us-pcs', 11)).toEqual([]);
    expect(failed('us-pcs', 11.1)).toHaveLength(1);
  });

  it('generic allows 5 %: 10.5 kW passes, 10.6 kW fails', () => {
    // our own default, 5 % (from memory)
    expect(failed('generic', 10.5)).toEqual([]);
    expect(failed('generic', 10.6)).toHaveLength(1);
  });

  it.each(['au-4777', 'de-4105'] as const)('%s has no tolerance', (profile) => {
    expect(failed(profile, 10)).toEqual([]);
    expect(failed(profile, 10.1)).toHaveLength(1);
  });

  it('does not fire without an export test', () => {
    expect(ruleFindings(mutated(baseThreePhaseSite(), (s) => { delete s.commissioning!.exportTest; }), 'export-test-failed')).toEqual([]);
  });
});

describe('failsafe-test-failed', () => {
  const failed = (observedS: number) => ruleFindings(mutated(baseThreePhaseSite(), (s) => { s.commissioning!.failSafeTest = { observedS }; }), 'failsafe-test-failed');

  it('passes at the configured 5 s', () => {
    expect(failed(4)).toEqual([]);
    expect(failed(5)).toEqual([]);
  });

  it('is an error when the fail-safe acted later than afterS', () => {
    const found = failed(5.5);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'commissioning.failSafeTest.observedS' });
  });
});

describe('commissioning-missing', () => {
  it('is an info on a site without a commissioning section', () => {
    const found = ruleFindings(mutated(baseThreePhaseSite(), (s) => { delete s.commissioning; }), 'commissioning-missing');
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('info');
  });

  it('does not fire on a commissioned site', () => {
    expect(ruleFindings(baseThreePhaseSite(), 'commissioning-missing')).toEqual([]);
  });
});
