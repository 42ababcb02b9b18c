import { describe, expect, it } from 'vitest';
import { summarizeSite, serviceCapacityKva, generationPerPhaseKva, exportLimitCurrentA, totalGenerationKva, effectiveVoltageLn } from './summary.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated } from '../test-support/base-site.ts';
import type { Site } from './types.ts';

const threeWire = () => mutated(baseThreePhaseSite(), (s) => {
  s.service = { arrangement: 'three-phase-3w', voltageLl: 480, frequencyHz: 60, mainBreakerA: 400 };
  s.meter.voltageInputs = { V1: 'L1', V2: 'L2', V3: 'L3' };
});

describe('S_svc, the service capacity', () => {
  it('three-phase: √3·V_LL·I_main/1000 = √3·400·100/1000 = 69.28 kVA', () => {
    // rules.md, "Export policy"
    expect(serviceCapacityKva(baseThreePhaseSite())).toBeCloseTo(69.282, 3);
  });

  it('three-phase-3w: √3·480·400/1000 = 332.55 kVA', () => {
    expect(serviceCapacityKva(threeWire())).toBeCloseTo(332.554, 3);
  });

  it('split-phase: V_LL·I_main/1000 = 240·200/1000 = 48 kVA', () => {
    expect(serviceCapacityKva(baseSplitPhaseSite())).toBeCloseTo(48, 10);
  });

  it('single-phase: V_LN·I_main/1000 = 230·80/1000 = 18.4 kVA', () => {
    expect(serviceCapacityKva(baseSinglePhaseSite())).toBeCloseTo(18.4, 10);
  });
});

describe('generation per phase', () => {
  it('adds each group to its phase and splits `all` evenly over the live conductors', () => {
    // rules.md phase-imbalance: `all` units split evenly
    const site = mutated(baseThreePhaseSite(), (s) => {
      s.generation = [{ id: 'string', units: 1, unitAcKw: 12, phase: 'all' }, { id: 'micro', units: 9, unitAcKw: 0.4, phase: 'L1' }];
    });
    const perPhase = generationPerPhaseKva(site);
    expect(perPhase.L1).toBeCloseTo(7.6, 10);
    expect(perPhase.L2).toBeCloseTo(4, 10);
    expect(perPhase.L3).toBeCloseTo(4, 10);
    const summary = summarizeSite(site);
    expect(summary.generationTotalKva).toBeCloseTo(15.6, 10);
    expect(summary.imbalanceKva).toBeCloseTo(3.6, 10);
  });

  it('split-phase `all` goes half on L1 and half on L2', () => {
    const perPhase = generationPerPhaseKva(baseSplitPhaseSite());
    expect(perPhase.L1).toBeCloseTo(3.84, 10); // 20 · 0.384 / 2
    expect(perPhase.L2).toBeCloseTo(3.84, 10);
    expect(perPhase.L3).toBe(0);
  });

  it('G is Σ units·unitAcKw; a single-phase site has no imbalance figure', () => {
    expect(totalGenerationKva(baseSinglePhaseSite())).toBeCloseTo(4.8, 10);
    expect(summarizeSite(baseSinglePhaseSite()).imbalanceKva).toBeNull();
  });
});

describe('the export limit as a current per phase, I_lim', () => {
  it('aggregate: limitKw·1000/(n·V_LN) = 10 000/(3·230) = 14.49 A on each phase', () => {
    // rules.md ct-low-accuracy-at-limit
    const current = exportLimitCurrentA(baseThreePhaseSite());
    for (const c of ['L1', 'L2', 'L3'] as const) expect(current[c]).toBeCloseTo(14.493, 3);
  });

  it('per-phase: each phase\'s own limit over V_LN', () => {
    const site = mutated(baseThreePhaseSite(), (s) => { s.export.scope = 'per-phase'; s.export.perPhaseLimitKw = { L1: 2, L2: 3, L3: 4 }; });
    const current = exportLimitCurrentA(site);
    expect(current.L1).toBeCloseTo(8.696, 3);
    expect(current.L2).toBeCloseTo(13.043, 3);
    expect(current.L3).toBeCloseTo(17.391, 3);
  });

  it('split-phase: 5000/(2·120) = 20.83 A; single-phase: 3680/230 = 16 A', () => {
    expect(exportLimitCurrentA(baseSplitPhaseSite())).toEqual({ L1: expect.closeTo(20.833, 3), L2: expect.closeTo(20.833, 3) });
    expect(exportLimitCurrentA(baseSinglePhaseSite())).toEqual({ L1: expect.closeTo(16, 10) });
  });

  it('three-phase-3w takes V_LN = V_LL/√3 (480/√3 = 277.1 V)', () => {
    // IEC 60038 (secondary source): 277·√3 = 479.8, so 480 V line-to-line is 277 V line-to-neutral
    expect(effectiveVoltageLn(threeWire())).toBeCloseTo(277.13, 2);
    expect(exportLimitCurrentA(threeWire()).L1).toBeCloseTo(10000 / (3 * 277.128), 2);
  });
});

describe('CT figures', () => {
  it('gives each CT\'s % of rated at the limit and the interpolated ratio-error limit there', () => {
    const [ct] = summarizeSite(baseThreePhaseSite()).cts;
    expect(ct).toMatchObject({ id: 'ct-1', index: 0, conductor: 'L1', ratedPrimaryA: 100, ratedBurdenVa: 2.5 });
    expect(ct.percentOfRatedAtLimit).toBeCloseTo(14.493, 3);
    // IEC 61869-2:2012 Table 201 class 1: 3.0 % at 5 %, 1.5 % at 20 %; at 14.49 %: 3.0 − 1.5·(9.49/15) = 2.05 %
    expect(ct.ratioErrorLimitPercent).toBeCloseTo(3.0 - (1.5 * (14.4928 - 5)) / 15, 3);
  });

  it('gives the lead burden: worked example 1.482 VA, 1.582 VA with the meter input', () => {
    // IEC 60228:2004 class 2, 2.5 mm² = 7.41 Ω/km (secondary source); meter input 0.1 VA (from memory)
    const [ct] = summarizeSite(baseThreePhaseSite()).cts;
    expect(ct.leadBurdenVa).toBeCloseTo(1.482, 10);
    expect(ct.totalBurdenVa).toBeCloseTo(1.582, 10);
    const withInput = summarizeSite(mutated(baseThreePhaseSite(), (s) => { s.meter.inputBurdenVa = 0.5; })).cts[0];
    expect(withInput.totalBurdenVa).toBeCloseTo(1.982, 10);
  });

  it('has no burden figure for a 333 mV CT and no ratio-error figure below the class\'s range', () => {
    const [ct] = summarizeSite(baseSplitPhaseSite()).cts;
    expect(ct.leadBurdenVa).toBeNull();
    expect(ct.totalBurdenVa).toBeNull();
    const zero = summarizeSite(mutated(baseThreePhaseSite(), (s) => { s.agreement.exportLimitKw = 0; s.export.limitKw = 0; })).cts[0];
    expect(zero.percentOfRatedAtLimit).toBe(0);
    expect(zero.ratioErrorLimitPercent).toBeNull();
  });
});

describe('the rest of the summary', () => {
  it('bus length against its limits: 1000 m (Modbus §3.4.3) and 1200 m (TIA/EIA-485-A)', () => {
    // Modbus over Serial Line V1.02 §3.4.3: 1000 m; TIA/EIA-485-A: about 1200 m (secondary source)
    expect(summarizeSite(baseThreePhaseSite()).bus).toEqual({ lengthM: 25, warnAboveM: 1000, limitM: 1200, percentOfLimit: expect.closeTo(2.083, 3) });
  });

  it('carries the limits, the live conductors and the profile', () => {
    const summary = summarizeSite(baseSplitPhaseSite());
    expect(summary).toMatchObject({ exportLimitKw: 5, agreementLimitKw: 5, liveConductors: ['L1', 'L2'] });
    expect(summary.serviceCapacityKva).toBeCloseTo(48, 10);
    expect(summary.profile.id).toBe('us-pcs');
  });

  it('does not mutate the site', () => {
    const site: Site = baseThreePhaseSite();
    const before = structuredClone(site);
    summarizeSite(site);
    expect(site).toEqual(before);
  });
});
