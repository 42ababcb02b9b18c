import { describe, expect, it } from 'vitest';
import type { ProfileId, Site } from '../site/types.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

describe('export-limit-over-agreement', () => {
  const over = (site: Site) => ruleFindings(site, 'export-limit-over-agreement');

  it('does not fire when the limit equals the agreement', () => {
    expect(over(baseThreePhaseSite())).toEqual([]);
  });

  it('does not fire when the limit is below the agreement', () => {
    expect(over(mutated(baseThreePhaseSite(), (s) => { s.export.limitKw = 9.5; }))).toEqual([]);
  });

  it('fires as an error when the limit is above the agreement (12 kW over 10 kW)', () => {
    const found = over(mutated(baseThreePhaseSite(), (s) => { s.export.limitKw = 12; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'export.limitKw' });
  });

  it('gives the "kW typed as W?" hint when the value /1000 fits the agreement (5000 for 5 kW)', () => {
    // rules.md export-limit-over-agreement: if the value /1000 would fit, the hint says "kW typed as W?"
    const found = over(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 5; s.export.limitKw = 5000; }));
    expect(found).toHaveLength(1);
    expect(found[0].hint).toContain('kW typed as W?');
  });

  it('gives no W hint when the value is only a little over the agreement (6 for 5 kW)', () => {
    // 6/1000 would fit, but 6 is a wrong number, not 6 W: the hint would mislead.
    const found = over(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 5; s.export.limitKw = 6; }));
    expect(found).toHaveLength(1);
    expect(found[0].hint ?? '').not.toContain('kW typed as W?');
  });

  it('gives no W hint when even the value /1000 exceeds the agreement (zero export, limit 5 kW)', () => {
    const found = over(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 0; s.export.limitKw = 5; }));
    expect(found).toHaveLength(1);
    expect(found[0].hint ?? '').not.toContain('kW typed as W?');
  });
});

describe('export-limit-over-service', () => {
  const over = (site: Site) => ruleFindings(site, 'export-limit-over-service');

  it('three-phase: S_svc = √3·V_LL·I/1000 = √3·400·100/1000 = 69.28 kVA', () => {
    // rules.md, "Export policy": S_svc = √3·V_LL·I_main/1000 for three-phase
    const at = (limitKw: number) => over(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 100; s.export.limitKw = limitKw; }));
    expect(at(69.2)).toEqual([]);
    const found = at(69.3);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'export.limitKw' });
  });

  it('split-phase: S_svc = V_LL·I/1000 = 240·200/1000 = 48 kVA', () => {
    // rules.md, "Export policy": S_svc = V_LL·I_main/1000 for split-phase
    const at = (limitKw: number) => over(mutated(baseSplitPhaseSite(), (s) => { s.agreement.exportLimitKw = 100; s.export.limitKw = limitKw; }));
    expect(at(48)).toEqual([]);
    expect(at(48.1)).toHaveLength(1);
  });

  it('single-phase: S_svc = V_LN·I/1000 = 230·80/1000 = 18.4 kVA', () => {
    // rules.md, "Export policy": S_svc = V_LN·I_main/1000 for single-phase
    const at = (limitKw: number) => over(mutated(baseSinglePhaseSite(), (s) => { s.agreement.exportLimitKw = 100; s.export.limitKw = limitKw; }));
    expect(at(18.4)).toEqual([]);
    expect(at(18.5)).toHaveLength(1);
  });

  it('three-phase-3w: S_svc = √3·V_LL·I/1000 too (no V_LN given)', () => {
    const at = (limitKw: number) => over(mutated(baseThreePhaseSite(), (s) => {
      s.service = { arrangement: 'three-phase-3w', voltageLl: 400, frequencyHz: 50, mainBreakerA: 100 };
      s.meter.voltageInputs = { V1: 'L1', V2: 'L2', V3: 'L3' };
      s.agreement.exportLimitKw = 100;
      s.export.limitKw = limitKw;
    }));
    expect(at(69.2)).toEqual([]);
    expect(at(69.3)).toHaveLength(1);
  });
});

describe('export-control-disabled', () => {
  const disabled = (site: Site) => ruleFindings(site, 'export-control-disabled');

  it('fires as an error when control is disabled and G (12 kVA) exceeds the agreed 10 kW', () => {
    const found = disabled(mutated(baseThreePhaseSite(), (s) => { s.export.control = 'disabled'; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'export.control' });
  });

  it('does not fire when control is enabled', () => {
    expect(disabled(baseThreePhaseSite())).toEqual([]);
  });

  it('does not fire when control is disabled but G equals the agreement (G = Σ units·unitAcKw = 25·0.4 = 10)', () => {
    const site = mutated(baseThreePhaseSite(), (s) => {
      s.export.control = 'disabled';
      s.generation = [{ id: 'roof', units: 25, unitAcKw: 0.4, phase: 'all' }];
    });
    expect(disabled(site)).toEqual([]);
  });
});

describe('export-control-unneeded', () => {
  const unneeded = (site: Site) => ruleFindings(site, 'export-control-unneeded');

  it('is an info when G ≤ the agreement (G = 10 kVA, agreement 10 kW)', () => {
    const found = unneeded(mutated(baseThreePhaseSite(), (s) => { s.generation = [{ id: 'roof', units: 25, unitAcKw: 0.4, phase: 'all' }]; }));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('info');
  });

  it('does not fire when G (12 kVA) exceeds the agreement', () => {
    expect(unneeded(baseThreePhaseSite())).toEqual([]);
  });

  it('does not fire on a zero-export site with generation', () => {
    expect(unneeded(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 0; s.export.limitKw = 0; }))).toEqual([]);
  });
});

describe('export-per-phase-incomplete', () => {
  const incomplete = (site: Site) => ruleFindings(site, 'export-per-phase-incomplete');
  const perPhase = (limits: Partial<Record<'L1' | 'L2' | 'L3', number>>, limitKw = 10) => mutated(baseThreePhaseSite(), (s) => {
    s.export.scope = 'per-phase';
    s.export.limitKw = limitKw;
    s.export.perPhaseLimitKw = limits;
  });

  it('does not fire when every live conductor has a limit and they add up to limitKw', () => {
    expect(incomplete(perPhase({ L1: 3, L2: 3, L3: 4 }))).toEqual([]);
  });

  it('fires as an error when a live conductor has no limit', () => {
    const found = incomplete(perPhase({ L1: 3, L2: 3 }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'export.perPhaseLimitKw' });
    expect(found[0].message).toContain('L3');
  });

  it('fires when the per-phase limits add up to more than limitKw (3.5·3 = 10.5 > 10)', () => {
    expect(incomplete(perPhase({ L1: 3.5, L2: 3.5, L3: 3.5 }))).toHaveLength(1);
  });

  it('does not fire under aggregate scope, where per-phase values are not needed (common practice)', () => {
    expect(incomplete(mutated(baseThreePhaseSite(), (s) => { s.export.perPhaseLimitKw = { L1: 1 }; }))).toEqual([]);
  });

  it('split-phase needs L1 and L2 only', () => {
    const site = mutated(baseSplitPhaseSite(), (s) => { s.export.scope = 'per-phase'; s.export.perPhaseLimitKw = { L1: 2.5, L2: 2.5 }; });
    expect(incomplete(site)).toEqual([]);
    const missing = mutated(baseSplitPhaseSite(), (s) => { s.export.scope = 'per-phase'; s.export.perPhaseLimitKw = { L1: 2.5, L3: 2.5 }; });
    expect(incomplete(missing)).toHaveLength(1);
  });
});

describe('failsafe-too-slow', () => {
  const slow = (profile: ProfileId, afterS: number) => ruleFindings(mutated(baseThreePhaseSite(), (s) => {
    s.agreement.profile = profile;
    s.export.failSafe.afterS = afterS;
    s.commissioning = undefined;
  }), 'failsafe-too-slow');

  it('gb-g100: 15 s passes, 15.5 s is an error', () => {
    // ENA EREC G100 Issue 2: export down "typically within 15 s" (secondary source)
    expect(slow('gb-g100', 15)).toEqual([]);
    const found = slow('gb-g100', 15.5);
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'export.failSafe.afterS' });
  });

  it('au-4777: 15 s passes, 16 s is an error', () => {
    // AS/NZS 4777.1:2016 cl. 3.4.8; 15 s from memory
    expect(slow('au-4777', 15)).toEqual([]);
    expect(slow('au-4777', 16)).toHaveLength(1);
  });

  it('us-pcs: 30 s passes, 31 s is an error', () => {
    // UL 1741 PCS requirement decision: open-loop response ≤ 30 s (secondary source)
    expect(slow('us-pcs', 30)).toEqual([]);
    expect(slow('us-pcs', 31)).toHaveLength(1);
  });

  it.each(['de-4105', 'generic'] as const)('%s has no maxResponseS: an info that says "not set by this profile"', (profile) => {
    // rules.md, "Profiles": a null value means the rule is skipped, and the finding says "not set by this profile"
    const found = slow(profile, 600);
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('info');
    expect(found[0].message).toContain('not set by this profile');
  });
});
