import { describe, expect, it } from 'vitest';
import {
  COPPER_CLASS2_OHM_PER_KM, DEFAULT_METER_INPUT_BURDEN_VA, copperResistanceOhmPerKm, leadBurdenVa, leadLoopResistanceOhm,
  lowestDefinedPercent, ratedSecondaryA, ratioErrorLimitPercent,
} from './ct.ts';

describe('IEC 61869-2 ratio-error limits', () => {
  it.each([
    // IEC 61869-2:2012 Tables 201/202, ± % at 5 / 20 / 100 / 120 % of rated current (secondary source)
    ['0.2', 5, 0.75], ['0.2', 20, 0.35], ['0.2', 100, 0.2], ['0.2', 120, 0.2],
    ['0.5', 5, 1.5], ['0.5', 20, 0.75], ['0.5', 100, 0.5], ['0.5', 120, 0.5],
    ['1', 5, 3.0], ['1', 20, 1.5], ['1', 100, 1.0], ['1', 120, 1.0],
    // S classes at 1 / 5 / 20–120 % (secondary source)
    ['0.5S', 1, 1.5], ['0.5S', 5, 0.75], ['0.5S', 20, 0.5], ['0.5S', 120, 0.5],
    ['0.2S', 1, 0.75], ['0.2S', 5, 0.35], ['0.2S', 20, 0.2], ['0.2S', 120, 0.2],
  ] as const)('class %s at %i %% of rated: ±%f %%', (cls, percent, limit) => {
    expect(ratioErrorLimitPercent(cls, percent)).toBeCloseTo(limit, 10);
  });

  it('interpolates linearly between the table points', () => {
    // IEC 61869-2:2012 Table 201 class 1: 3.0 % at 5 %, 1.5 % at 20 %, so 2.25 % half-way at 12.5 %
    expect(ratioErrorLimitPercent('1', 12.5)).toBeCloseTo(2.25, 10);
    expect(ratioErrorLimitPercent('1', 10)).toBeCloseTo(2.5, 10); // 3.0 − 1.5·(5/15)
    expect(ratioErrorLimitPercent('1', 60)).toBeCloseTo(1.25, 10); // 1.5 → 1.0 from 20 to 100 %
    // Table 202 class 0.5S: 1.5 % at 1 %, 0.75 % at 5 %, so 1.125 % at 3 %
    expect(ratioErrorLimitPercent('0.5S', 3)).toBeCloseTo(1.125, 10);
    // 20–120 % is flat for the S classes
    expect(ratioErrorLimitPercent('0.2S', 70)).toBeCloseTo(0.2, 10);
  });

  it('is undefined below the lowest point and above 120 %', () => {
    expect(ratioErrorLimitPercent('1', 4.99)).toBeNull();
    expect(ratioErrorLimitPercent('0.5S', 0.99)).toBeNull();
    expect(ratioErrorLimitPercent('0.5', 120.1)).toBeNull();
    expect(ratioErrorLimitPercent('1', Number.NaN)).toBeNull();
  });

  it('the lowest defined point is 5 % for classes 0.2/0.5/1 and 1 % for the S classes', () => {
    // rules.md ct-low-accuracy-at-limit; IEC 61869-2:2012 Tables 201/202
    expect(['0.2', '0.5', '1'].map((c) => lowestDefinedPercent(c as '1'))).toEqual([5, 5, 5]);
    expect(['0.2S', '0.5S'].map((c) => lowestDefinedPercent(c as '0.5S'))).toEqual([1, 1]);
  });
});

describe('IEC 60228 lead resistance and burden', () => {
  it('holds the class 1/2 copper table', () => {
    // IEC 60228:2004 class 1/2 plain copper, max DC resistance at 20 °C, Ω/km (secondary sources)
    expect(COPPER_CLASS2_OHM_PER_KM.map(([csa, r]) => [csa, r])).toEqual([
      [0.5, 36.0], [0.75, 24.5], [1.0, 18.1], [1.5, 12.1], [2.5, 7.41], [4, 4.61], [6, 3.08],
    ]);
    for (const [csa, r] of COPPER_CLASS2_OHM_PER_KM) expect(copperResistanceOhmPerKm(csa)).toBe(r);
  });

  it('worked example: 5 A, 4 m one-way of 2.5 mm² → R_loop 0.05928 Ω, 1.482 VA', () => {
    // check-values.md, IEC 60228:2004: R_loop = 2 × 4 × 7.41/1000 = 0.05928 Ω; 25 × 0.05928 = 1.482 VA
    expect(leadLoopResistanceOhm({ lengthM: 4, csaMm2: 2.5 })).toBeCloseTo(0.05928, 10);
    expect(leadBurdenVa('5A', { lengthM: 4, csaMm2: 2.5 })).toBeCloseTo(1.482, 10);
  });

  it('a 1 A secondary carries I_sn² = 1 times the loop resistance', () => {
    // IEC 61869-2:2012 cl. 5.202: rated secondary current 1 A or 5 A; IEC 60228 1.5 mm² = 12.1 Ω/km
    expect(leadBurdenVa('1A', { lengthM: 10, csaMm2: 1.5 })).toBeCloseTo(0.242, 10);
  });

  it('has no burden figure for voltage or milliamp outputs', () => {
    for (const s of ['333mV', '100mA', '50mA', '40mA'] as const) {
      expect(ratedSecondaryA(s)).toBeNull();
      expect(leadBurdenVa(s, { lengthM: 4, csaMm2: 2.5 })).toBeNull();
    }
    expect(ratedSecondaryA('5A')).toBe(5);
    expect(ratedSecondaryA('1A')).toBe(1);
  });

  it('the default meter input burden is 0.1 VA', () => {
    // rules.md ct-burden-exceeded: meter.inputBurdenVa default 0.1 VA (from memory)
    expect(DEFAULT_METER_INPUT_BURDEN_VA).toBe(0.1);
  });
});
