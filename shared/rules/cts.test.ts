import { describe, expect, it } from 'vitest';
import type { AccuracyClass, Site } from '../site/types.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

describe('ct-undersized', () => {
  const undersized = (site: Site) => ruleFindings(site, 'ct-undersized');

  it('does not fire when the CTs are rated at the main breaker (100 A CT, 100 A breaker)', () => {
    // common practice: a CT's rated primary current is at least the main breaker rating
    expect(undersized(baseThreePhaseSite())).toEqual([]);
  });

  it('fires as an error on each CT rated below the main breaker', () => {
    const found = undersized(mutated(baseThreePhaseSite(), (s) => { for (const ct of s.cts) ct.ratedPrimaryA = 80; }));
    expect(found.map((f) => f.path)).toEqual(['cts[0].ratedPrimaryA', 'cts[1].ratedPrimaryA', 'cts[2].ratedPrimaryA']);
    expect(found.every((f) => f.severity === 'error')).toBe(true);
  });

  it('fires just below the breaker rating (99.9 A on 100 A)', () => {
    expect(undersized(mutated(baseThreePhaseSite(), (s) => { s.cts[1].ratedPrimaryA = 99.9; }))).toHaveLength(1);
  });
});

describe('ct-mixed-ratio', () => {
  const mixed = (site: Site) => ruleFindings(site, 'ct-mixed-ratio');

  it('does not fire when every CT on the meter has the same ratio', () => {
    expect(mixed(baseThreePhaseSite())).toEqual([]);
  });

  it('fires as an error when one CT differs in rated primary current', () => {
    const found = mixed(mutated(baseThreePhaseSite(), (s) => { s.cts[2].ratedPrimaryA = 200; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'cts[2].ratedPrimaryA' });
  });

  it('fires when one CT differs in secondary (1A among 5A)', () => {
    const found = mixed(mutated(baseThreePhaseSite(), (s) => { s.cts[1].secondary = '1A'; }));
    expect(found).toHaveLength(1);
    expect(found[0].path).toBe('cts[1].secondary');
  });

  it('does not count a spare CT listed in cts but on no current input of the meter', () => {
    const site = mutated(baseThreePhaseSite(), (s) => { s.cts.push({ id: 'spare', ratedPrimaryA: 200, secondary: '1A', accuracyClass: '1', arrow: 'toward-load' }); });
    expect(mixed(site)).toEqual([]);
  });
});

describe('ct-low-accuracy-at-limit', () => {
  const low = (site: Site) => ruleFindings(site, 'ct-low-accuracy-at-limit');
  const aggregate = (limitKw: number, accuracyClass: AccuracyClass = '1') => mutated(baseThreePhaseSite(), (s) => {
    s.export.limitKw = limitKw;
    for (const ct of s.cts) ct.accuracyClass = accuracyClass;
    s.commissioning = undefined;
  });

  it('does not fire at 14.5 % of rated (10 kW aggregate: I_lim = 10 000/(3·230) = 14.49 A on 100 A)', () => {
    // rules.md: I_lim = limitKw·1000/(n·V_LN) for aggregate scope
    expect(low(baseThreePhaseSite())).toEqual([]);
  });

  it('class 1: 3.5 kW (I_lim 5.07 A, 5.07 %) passes; 3.4 kW (4.93 A, 4.93 %) warns on each CT', () => {
    // IEC 61869-2:2012 Table 201 (secondary source): classes 0.2/0.5/1 are defined from 5 % of rated current
    expect(low(aggregate(3.5))).toEqual([]);
    const found = low(aggregate(3.4));
    expect(found).toHaveLength(3);
    expect(found.every((f) => f.severity === 'warning')).toBe(true);
    expect(found[0].path).toBe('cts[0].ratedPrimaryA');
    // rules.md: the message gives I_lim as a % of rated (3400/690 = 4.928 A of 100 A)
    expect(found[0].message).toMatch(/4\.93\s*%/);
  });

  it.each(['0.2', '0.5'] as const)('class %s is also defined from 5 %: 4.93 % warns', (accuracyClass) => {
    // IEC 61869-2:2012 Table 201 (secondary source)
    expect(low(aggregate(3.4, accuracyClass))).toHaveLength(3);
    expect(low(aggregate(3.5, accuracyClass))).toEqual([]);
  });

  it.each(['0.2S', '0.5S'] as const)('class %s is defined from 1 %: 4.93 % passes, 0.99 % warns', (accuracyClass) => {
    // IEC 61869-2:2012 Table 202 (secondary source): the S classes are defined from 1 % of rated current
    expect(low(aggregate(3.4, accuracyClass))).toEqual([]);
    expect(low(aggregate(0.7, accuracyClass))).toEqual([]); // 700/690 = 1.01 A, 1.01 %
    expect(low(aggregate(0.68, accuracyClass))).toHaveLength(3); // 680/690 = 0.99 A, 0.99 %
  });

  it('per-phase scope uses each phase\'s own limit: 0.1 kW on L1 is 0.43 A, 0.43 % of 100 A', () => {
    // rules.md: I_lim is the per-phase value under per-phase scope
    const site = mutated(baseThreePhaseSite(), (s) => {
      s.export.scope = 'per-phase';
      s.export.perPhaseLimitKw = { L1: 0.1, L2: 3, L3: 3 };
    });
    const found = low(site);
    expect(found).toHaveLength(1);
    expect(found[0].path).toBe('cts[0].ratedPrimaryA');
  });

  it('single-phase: n = 1, so 3.68 kW on 230 V is 16 A (16 %) and passes; 1 kW on a 400 A CT (1.09 %) warns', () => {
    expect(low(baseSinglePhaseSite())).toEqual([]);
    const big = mutated(baseSinglePhaseSite(), (s) => { s.export.limitKw = 1; s.cts[0].ratedPrimaryA = 400; });
    expect(low(big)).toHaveLength(1);
  });

  it('split-phase: n = 2, 5 kW on 120 V is 20.8 A, 10.4 % of 200 A', () => {
    expect(low(baseSplitPhaseSite())).toEqual([]);
    // 1.1 kW: 1100/(2·120) = 4.58 A, 2.29 % of 200 A, below class 0.5's 5 %
    expect(low(mutated(baseSplitPhaseSite(), (s) => { s.export.limitKw = 1.1; }))).toHaveLength(2);
  });

  it('zero export: I_lim = 0 A is below every class\'s lowest point, so it warns', () => {
    const found = low(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 0; s.export.limitKw = 0; s.commissioning = undefined; }));
    expect(found).toHaveLength(3);
  });
});

describe('ct-burden-exceeded', () => {
  const burden = (site: Site) => ruleFindings(site, 'ct-burden-exceeded');
  const oneCt = (change: (ct: Site['cts'][number], s: Site) => void) => mutated(baseSinglePhaseSite(), (s) => change(s.cts[0], s));

  it('worked example: 5 A, 4 m of 2.5 mm² gives 1.482 VA of leads + 0.1 VA meter = 1.582 VA, within 2.5 VA', () => {
    // IEC 60228:2004 class 2, 2.5 mm² = 7.41 Ω/km (secondary source): R_loop = 2·4·7.41/1000 = 0.05928 Ω,
    // lead burden 5²·0.05928 = 1.482 VA; meter input 0.1 VA by default (from memory)
    expect(burden(baseSinglePhaseSite())).toEqual([]);
  });

  it('the same leads exceed a 1.5 VA rating only because of the default 0.1 VA meter input', () => {
    // 1.482 + 0.1 = 1.582 VA > 1.5 VA; with inputBurdenVa 0, 1.482 VA ≤ 1.5 VA
    const found = burden(oneCt((ct) => { ct.ratedBurdenVa = 1.5; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'cts[0].lead' });
    // rules.md: the message shows both in VA
    expect(found[0].message).toContain('1.582');
    expect(found[0].message).toContain('1.5 VA');
    expect(burden(oneCt((ct, s) => { ct.ratedBurdenVa = 1.5; s.meter.inputBurdenVa = 0; }))).toEqual([]);
  });

  it('10 m of 1.5 mm² on a 5 A secondary: 25·2·10·12.1/1000 = 6.05 VA + 0.1 VA exceeds 5 VA', () => {
    // IEC 60228:2004 class 2, 1.5 mm² = 12.1 Ω/km (secondary source)
    expect(burden(oneCt((ct) => { ct.ratedBurdenVa = 5; ct.lead = { lengthM: 10, csaMm2: 1.5 }; }))).toHaveLength(1);
    // IEC 60228:2004 class 2, 6 mm² = 3.08 Ω/km: 25·2·10·3.08/1000 = 1.54 VA + 0.1 VA fits 2.5 VA
    expect(burden(oneCt((ct) => { ct.ratedBurdenVa = 2.5; ct.lead = { lengthM: 10, csaMm2: 6 }; }))).toEqual([]);
  });

  it('1 A secondary: I_sn² = 1, so 20 m of 1.5 mm² is 0.484 VA + 0.1 VA = 0.584 VA', () => {
    // IEC 61869-2:2012 cl. 5.202: rated secondary 1 A or 5 A; IEC 60228 1.5 mm² = 12.1 Ω/km
    expect(burden(oneCt((ct) => { ct.secondary = '1A'; ct.ratedBurdenVa = 2.5; ct.lead = { lengthM: 20, csaMm2: 1.5 }; }))).toEqual([]);
    expect(burden(oneCt((ct) => { ct.secondary = '1A'; ct.ratedBurdenVa = 0.5; ct.lead = { lengthM: 20, csaMm2: 1.5 }; }))).toHaveLength(1);
  });

  it.each(['333mV', '100mA', '50mA', '40mA'] as const)('does not apply to a %s secondary, however long the leads', (secondary) => {
    // rules.md ct-burden-exceeded: 1A/5A secondaries only
    expect(burden(oneCt((ct) => { ct.secondary = secondary; ct.ratedBurdenVa = 0.5; ct.lead = { lengthM: 100, csaMm2: 0.5 }; }))).toEqual([]);
  });
});

describe('ct-arrow-toward-grid', () => {
  const arrow = (site: Site) => ruleFindings(site, 'ct-arrow-toward-grid');

  it('does not fire when every arrow points toward the load', () => {
    // common practice: the arrow points the way import current flows, toward the loads
    expect(arrow(baseThreePhaseSite())).toEqual([]);
  });

  it('warns on a CT whose arrow points toward the grid', () => {
    const found = arrow(mutated(baseThreePhaseSite(), (s) => { s.cts[1].arrow = 'toward-grid'; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'warning', path: 'cts[1].arrow' });
  });
});
