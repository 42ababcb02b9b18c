import { describe, expect, it } from 'vitest';
import { NOMINAL_SYSTEMS, SQRT3, VOLTAGE_RATIO_TOLERANCE, lineToLine, relativeDeviation } from './voltage.ts';
import { hasNeutral, isThreePhase, liveConductors } from './conductors.ts';

describe('IEC 60038 voltages', () => {
  it.each([
    // IEC 60038:2009 (secondary source): V_LL = √3·V_LN
    [230, 398.4], [120, 207.8], [277, 479.8], [347, 601.0],
  ])('%i·√3 = %f', (ln, ll) => {
    expect(lineToLine(ln)).toBeCloseTo(ll, 1);
    expect(SQRT3 * ln).toBeCloseTo(ll, 1);
  });

  it('split-phase line-to-line is 2·V_LN', () => {
    expect(lineToLine(120, 'split-phase')).toBe(240);
  });

  it('the ratio tolerance is 2 % (nominal pairs are rounded)', () => {
    // check-values.md: nominal pairs are rounded, so use a 2 % tolerance
    expect(VOLTAGE_RATIO_TOLERANCE).toBe(0.02);
    expect(relativeDeviation(400, 230 * SQRT3)).toBeLessThan(0.02);
    expect(relativeDeviation(600, 347 * SQRT3)).toBeLessThan(0.02);
  });

  it('holds the systems of IEC 60038 Table 1', () => {
    const has = (ln: number | null, ll: number, hz: 50 | 60, kind: string) =>
      NOMINAL_SYSTEMS.some((s) => s.voltageLn === ln && s.voltageLl === ll && s.frequencyHz === hz && s.kind === kind);
    // IEC 60038:2009 Table 1, 50 Hz (secondary source): 230/400 and 400/690 V 4-wire; 1000 V 3-wire
    expect(has(230, 400, 50, 'three-phase-4w')).toBe(true);
    expect(has(400, 690, 50, 'three-phase-4w')).toBe(true);
    expect(has(null, 1000, 50, 'three-phase-3w')).toBe(true);
    // 60 Hz (secondary source): 120/208, 240, 230/400, 277/480, 480, 347/600, 600 V; split-phase 120/240 V
    expect(has(120, 208, 60, 'three-phase-4w')).toBe(true);
    expect(has(null, 240, 60, 'three-phase-3w')).toBe(true);
    expect(has(230, 400, 60, 'three-phase-4w')).toBe(true);
    expect(has(277, 480, 60, 'three-phase-4w')).toBe(true);
    expect(has(null, 480, 60, 'three-phase-3w')).toBe(true);
    expect(has(347, 600, 60, 'three-phase-4w')).toBe(true);
    expect(has(null, 600, 60, 'three-phase-3w')).toBe(true);
    expect(has(120, 240, 60, 'split-phase')).toBe(true);
    // not in Table 1
    expect(NOMINAL_SYSTEMS.some((s) => s.voltageLl === 415)).toBe(false);
    expect(has(120, 208, 50, 'three-phase-4w')).toBe(false);
  });
});

describe('conductors', () => {
  it('single-phase uses L1; split-phase L1 and L2; three-phase L1, L2 and L3', () => {
    // site-format.md, "Conductors"
    expect(liveConductors('single-phase')).toEqual(['L1']);
    expect(liveConductors('split-phase')).toEqual(['L1', 'L2']);
    expect(liveConductors('three-phase-4w')).toEqual(['L1', 'L2', 'L3']);
    expect(liveConductors('three-phase-3w')).toEqual(['L1', 'L2', 'L3']);
  });

  it('three-phase-3w has no N', () => {
    expect(hasNeutral('three-phase-3w')).toBe(false);
    expect(['single-phase', 'split-phase', 'three-phase-4w'].every((a) => hasNeutral(a as 'single-phase'))).toBe(true);
    expect(isThreePhase('three-phase-3w') && isThreePhase('three-phase-4w') && !isThreePhase('split-phase')).toBe(true);
  });
});
