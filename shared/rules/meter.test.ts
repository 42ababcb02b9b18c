import { describe, expect, it } from 'vitest';
import type { Site } from '../site/types.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

describe('meter-position-feeder', () => {
  const feeder = (site: Site) => ruleFindings(site, 'meter-position-feeder');

  it('fires as an error on a generation-feeder meter with export control enabled', () => {
    // rules.md: the meter must see the net flow at the grid connection point (common practice)
    const found = feeder(mutated(baseThreePhaseSite(), (s) => { s.meter.position = 'generation-feeder'; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'meter.position' });
  });

  it('does not fire at the grid connection point', () => {
    expect(feeder(baseThreePhaseSite())).toEqual([]);
  });

  it('does not fire on a generation-feeder meter when export control is disabled', () => {
    expect(feeder(mutated(baseThreePhaseSite(), (s) => { s.meter.position = 'generation-feeder'; s.export.control = 'disabled'; }))).toEqual([]);
  });
});

describe('meter-voltage-wiring', () => {
  const wiring = (site: Site) => ruleFindings(site, 'meter-voltage-wiring');

  it('does not fire when each live conductor is on one voltage input and N is on N', () => {
    expect(wiring(baseThreePhaseSite())).toEqual([]);
    expect(wiring(baseSplitPhaseSite())).toEqual([]);
    expect(wiring(baseSinglePhaseSite())).toEqual([]);
  });

  it('fires as an error when one conductor is on two inputs and another on none', () => {
    const found = wiring(mutated(baseThreePhaseSite(), (s) => { s.meter.voltageInputs.V3 = 'L2'; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'meter.voltageInputs' });
  });

  it('fires when the neutral input is not wired on an arrangement with a neutral', () => {
    expect(wiring(mutated(baseSinglePhaseSite(), (s) => { delete s.meter.voltageInputs.N; }))).toHaveLength(1);
  });

  it('fires when a single-phase meter has a voltage input on L2, which is not live there', () => {
    expect(wiring(mutated(baseSinglePhaseSite(), (s) => { s.meter.voltageInputs.V2 = 'L2'; }))).toHaveLength(1);
  });

  it('three-phase-3w: no N is expected; wiring the N input fires', () => {
    const threeWire = (n: boolean) => mutated(baseThreePhaseSite(), (s) => {
      s.service = { arrangement: 'three-phase-3w', voltageLl: 400, frequencyHz: 50, mainBreakerA: 100 };
      s.meter.voltageInputs = n ? { V1: 'L1', V2: 'L2', V3: 'L3', N: 'N' } : { V1: 'L1', V2: 'L2', V3: 'L3' };
    });
    expect(wiring(threeWire(false))).toEqual([]);
    expect(wiring(threeWire(true))).toHaveLength(1);
  });
});

describe('meter-ct-missing', () => {
  const missing = (site: Site) => ruleFindings(site, 'meter-ct-missing');

  it('does not fire when every live conductor has a current input', () => {
    expect(missing(baseThreePhaseSite())).toEqual([]);
    expect(missing(baseSplitPhaseSite())).toEqual([]);
  });

  it('fires as an error, once per unmeasured conductor', () => {
    const found = missing(mutated(baseThreePhaseSite(), (s) => { delete s.meter.currentInputs.I3; }));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('error');
    expect(found[0].message).toContain('L3');
    const two = missing(mutated(baseThreePhaseSite(), (s) => { s.meter.currentInputs = { I1: { ct: 'ct-1', conductor: 'L1' } }; }));
    expect(two).toHaveLength(2);
  });

  it('split-phase needs L1 and L2 only', () => {
    expect(missing(mutated(baseSplitPhaseSite(), (s) => { delete s.meter.currentInputs.I2; }))).toHaveLength(1);
  });
});

describe('meter-ct-unknown', () => {
  const unknown = (site: Site) => ruleFindings(site, 'meter-ct-unknown');

  it('does not fire when every current input names a CT in cts', () => {
    expect(unknown(baseThreePhaseSite())).toEqual([]);
  });

  it('fires as an error at the input that names a CT id not in cts', () => {
    const found = unknown(mutated(baseThreePhaseSite(), (s) => { s.meter.currentInputs.I3 = { ct: 'ct-4', conductor: 'L3' }; }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'meter.currentInputs.I3.ct' });
  });
});

describe('meter-ct-phase-pair', () => {
  const pair = (site: Site) => ruleFindings(site, 'meter-ct-phase-pair');

  it('does not fire when each Ik is on the conductor of Vk', () => {
    // site-format.md: voltage input Vk pairs with current input Ik
    expect(pair(baseThreePhaseSite())).toEqual([]);
  });

  it('fires as an error on each input of two swapped CTs (I2 on L3, I3 on L2)', () => {
    const found = pair(mutated(baseThreePhaseSite(), (s) => {
      s.meter.currentInputs.I2 = { ct: 'ct-2', conductor: 'L3' };
      s.meter.currentInputs.I3 = { ct: 'ct-3', conductor: 'L2' };
    }));
    expect(found.map((f) => f.path)).toEqual(['meter.currentInputs.I2.conductor', 'meter.currentInputs.I3.conductor']);
    expect(found.every((f) => f.severity === 'error')).toBe(true);
  });

  it('does not fire when the voltage wiring follows the CTs (V2 on L3 with I2 on L3, and so on)', () => {
    const site = mutated(baseThreePhaseSite(), (s) => {
      s.meter.voltageInputs = { V1: 'L1', V2: 'L3', V3: 'L2', N: 'N' };
      s.meter.currentInputs.I2 = { ct: 'ct-2', conductor: 'L3' };
      s.meter.currentInputs.I3 = { ct: 'ct-3', conductor: 'L2' };
    });
    expect(pair(site)).toEqual([]);
  });
});
