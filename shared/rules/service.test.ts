import { describe, expect, it } from 'vitest';
import type { Site } from '../site/types.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

const withService = (base: () => Site, service: Partial<Site['service']>) =>
  mutated(base(), (s) => { s.service = { ...s.service, ...service }; });

describe('service-voltage-ratio', () => {
  const ratio = (site: Site) => ruleFindings(site, 'service-voltage-ratio');

  it('does not fire on 230/400 V: 230·√3 = 398.4 V is within 2 % of 400 V', () => {
    // IEC 60038:2009 Table 1 (secondary source): 230·√3 = 398.4; nominal pairs are rounded, 2 % tolerance
    expect(ratio(baseThreePhaseSite())).toEqual([]);
  });

  it.each([
    // IEC 60038:2009 Table 1 (secondary source): V_LL = √3·V_LN for each nominal pair
    [120, 208], // 120·√3 = 207.8
    [277, 480], // 277·√3 = 479.8
    [347, 600], // 347·√3 = 601.0
    [400, 690], // 400·√3 = 692.8
  ])('does not fire on %i/%i V (within 2 % of √3·V_LN)', (ln, ll) => {
    expect(ratio(withService(baseThreePhaseSite, { voltageLn: ln, voltageLl: ll, frequencyHz: 60 }))).toEqual([]);
  });

  it('fires on the 2 % boundary: 230·√3 = 398.37 V, so 406.5 V (+2.04 %) fires and 406.2 V (+1.97 %) does not', () => {
    // check-values.md: nominal pairs are rounded, so use a 2 % tolerance (IEC 60038)
    const expected = 230 * Math.sqrt(3);
    expect(expected).toBeCloseTo(398.4, 1);
    expect(ratio(withService(baseThreePhaseSite, { voltageLl: 406.2 }))).toEqual([]);
    expect(ratio(withService(baseThreePhaseSite, { voltageLl: 406.5 }))).toHaveLength(1);
    expect(ratio(withService(baseThreePhaseSite, { voltageLl: 390.6 }))).toEqual([]); // −1.95 %
    expect(ratio(withService(baseThreePhaseSite, { voltageLl: 390.2 }))).toHaveLength(1); // −2.05 %
  });

  it('fires when the line-to-neutral value was typed for line-to-line (230/230 V three-phase)', () => {
    const found = ratio(withService(baseThreePhaseSite, { voltageLl: 230 }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'service.voltageLl' });
  });

  it('split-phase: 120/240 V passes (V_LL = 2·V_LN) and 120/208 V fails', () => {
    // rules.md service-voltage-ratio: split-phase V_LL is compared with 2·V_LN
    expect(ratio(baseSplitPhaseSite())).toEqual([]);
    const found = ratio(withService(baseSplitPhaseSite, { voltageLl: 208 }));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('error');
  });

  it('does not apply to single-phase or three-phase-3w services', () => {
    expect(ratio(withService(baseSinglePhaseSite, { voltageLl: 999 }))).toEqual([]);
    const threeWire = mutated(baseThreePhaseSite(), (s) => {
      s.service = { arrangement: 'three-phase-3w', voltageLl: 400, frequencyHz: 50, mainBreakerA: 100 };
      s.meter.voltageInputs = { V1: 'L1', V2: 'L2', V3: 'L3' };
    });
    expect(ratio(threeWire)).toEqual([]);
  });
});

describe('service-voltage-nonstandard', () => {
  const nonstandard = (site: Site) => ruleFindings(site, 'service-voltage-nonstandard');

  it.each([
    // IEC 60038:2009 Table 1 (secondary source): 50 Hz systems 230/400 and 400/690 V
    [230, 400, 50],
    [400, 690, 50],
    // IEC 60038:2009 Table 1 (secondary source): 60 Hz systems 120/208, 230/400, 277/480, 347/600 V
    [120, 208, 60],
    [230, 400, 60],
    [277, 480, 60],
    [347, 600, 60],
  ] as const)('does not fire on a three-phase 4-wire %i/%i V at %i Hz', (ln, ll, hz) => {
    expect(nonstandard(withService(baseThreePhaseSite, { voltageLn: ln, voltageLl: ll, frequencyHz: hz }))).toEqual([]);
  });

  it.each([
    [120, 208, 50], // 120/208 V is a 60 Hz system only (IEC 60038 Table 1)
    [240, 415, 50], // not in IEC 60038 Table 1 (the old 240/415 V)
    [220, 380, 50], // not in IEC 60038 Table 1 (the old 220/380 V)
    [277, 480, 50], // 277/480 V is a 60 Hz system only
  ] as const)('fires as a warning on %i/%i V at %i Hz', (ln, ll, hz) => {
    const found = nonstandard(withService(baseThreePhaseSite, { voltageLn: ln, voltageLl: ll, frequencyHz: hz }));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('warning');
  });

  it('split-phase 120/240 V is nominal at 60 Hz but not at 50 Hz', () => {
    // IEC 60038:2009 Table 1 (secondary source): split-phase is 120/240 V, a 60 Hz system
    expect(nonstandard(baseSplitPhaseSite())).toEqual([]);
    expect(nonstandard(withService(baseSplitPhaseSite, { frequencyHz: 50 }))).toHaveLength(1);
  });

  it('three-phase-3w: 1000 V at 50 Hz and 480 V at 60 Hz are nominal, 415 V at 50 Hz is not', () => {
    // IEC 60038:2009 Table 1 (secondary source): 1000 V 3-wire at 50 Hz; 480 and 600 V at 60 Hz
    const threeWire = (ll: number, hz: 50 | 60) => mutated(baseThreePhaseSite(), (s) => {
      s.service = { arrangement: 'three-phase-3w', voltageLl: ll, frequencyHz: hz, mainBreakerA: 100 };
      s.meter.voltageInputs = { V1: 'L1', V2: 'L2', V3: 'L3' };
    });
    expect(nonstandard(threeWire(1000, 50))).toEqual([]);
    expect(nonstandard(threeWire(480, 60))).toEqual([]);
    expect(nonstandard(threeWire(600, 60))).toEqual([]);
    expect(nonstandard(threeWire(415, 50))).toHaveLength(1);
  });

  it('single-phase 230 V at 50 Hz is nominal; 110 V at 50 Hz is not', () => {
    // 230 V is the line-to-neutral value of IEC 60038's 230/400 V system (common practice for single-phase)
    expect(nonstandard(baseSinglePhaseSite())).toEqual([]);
    const found = nonstandard(withService(baseSinglePhaseSite, { voltageLn: 110 }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'warning', path: 'service.voltageLn' });
  });
});
