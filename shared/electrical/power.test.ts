import { describe, expect, it } from 'vitest';
import { phaseAngleDeg, powerFactorMagnitude, threePhaseCurrentA, threePhasePowerW, vectorApparentPower } from './power.ts';

describe('three-phase power, P = √3·V_LL·I·PF', () => {
  it('400 V, 20 A, PF 1 → 13 856 W', () => {
    // engineeringtoolbox.com, "three-phase electrical" (check-values.md)
    expect(threePhasePowerW(400, 20, 1)).toBeCloseTo(13856, 0);
    expect(threePhasePowerW(400, 20)).toBeCloseTo(13856.4, 1);
  });

  it('400 V, 20 A, PF 0.9 → 12 470.8 W (the source prints 12 456 W, using 1.73)', () => {
    // energyacademyuk.org, "three-phase power" (check-values.md)
    expect(threePhasePowerW(400, 20, 0.9)).toBeCloseTo(12470.8, 1);
  });

  it('30 kW at 400 V, PF 0.85 → 50.94 A', () => {
    // energyacademyuk.org, "three-phase power" (check-values.md)
    expect(threePhaseCurrentA(30000, 400, 0.85)).toBeCloseTo(50.94, 2);
  });

  it('400 V, 10 A, PF 0.9 → 6 235.4 W', () => {
    // check-values.md worked example
    expect(threePhasePowerW(400, 10, 0.9)).toBeCloseTo(6235.4, 1);
  });

  it('current and power are inverse', () => {
    expect(threePhaseCurrentA(threePhasePowerW(400, 37, 0.95), 400, 0.95)).toBeCloseTo(37, 10);
  });
});

describe('per-conductor PF and angle', () => {
  it('|PF| = |kw|·1000/(v·a)', () => {
    // rules.md, "Commissioning evidence"; IEEE Std 1459-2010: PF = P/S (formula layout from memory)
    expect(powerFactorMagnitude({ v: 250, a: 10, kw: -2 })).toBeCloseTo(0.8, 12);
    expect(powerFactorMagnitude({ v: 230, a: 0, kw: 0 })).toBeNull();
  });

  it('φ = atan2(kvar, kw) in degrees, null without kvar', () => {
    expect(phaseAngleDeg({ kw: -1, kvar: Math.sqrt(3) })).toBeCloseTo(120, 10);
    expect(phaseAngleDeg({ kw: 1, kvar: 0 })).toBe(0);
    expect(phaseAngleDeg({ kw: 1 })).toBeNull();
  });

  it('vector apparent power S_V = √(P² + Q²)', () => {
    // IEEE Std 1459-2010 (check-values.md)
    expect(vectorApparentPower(3, 4)).toBe(5);
  });
});
