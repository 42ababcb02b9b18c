// Current transformers: IEC 61869-2:2012 ratio-error limits and IEC 60228:2004 lead resistance.
import type { AccuracyClass, Secondary } from '../site/types.ts';

/**
 * Ratio-error limits, ± %, at % of rated current. IEC 61869-2:2012 Tables 201/202 (secondary
 * source). Class 3 is defined only from 50 % to 120 % of rated current, at ±3 % (from memory).
 */
export const RATIO_ERROR_LIMITS: Record<AccuracyClass, ReadonlyArray<readonly [percentOfRated: number, errorPercent: number]>> = {
  '0.2': [[5, 0.75], [20, 0.35], [100, 0.2], [120, 0.2]],
  '0.5': [[5, 1.5], [20, 0.75], [100, 0.5], [120, 0.5]],
  '1': [[5, 3.0], [20, 1.5], [100, 1.0], [120, 1.0]],
  '0.2S': [[1, 0.75], [5, 0.35], [20, 0.2], [120, 0.2]],
  '0.5S': [[1, 1.5], [5, 0.75], [20, 0.5], [120, 0.5]],
  '3': [[50, 3.0], [120, 3.0]],
};

/** The lowest % of rated current at which the class's ratio error is defined. */
export function lowestDefinedPercent(accuracyClass: AccuracyClass): number {
  return RATIO_ERROR_LIMITS[accuracyClass][0][0];
}

/**
 * The ratio-error limit (± %) at `percentOfRated`, linearly interpolated between the table's
 * points; null outside the defined range (below the lowest point, above 120 %).
 */
export function ratioErrorLimitPercent(accuracyClass: AccuracyClass, percentOfRated: number): number | null {
  const points = RATIO_ERROR_LIMITS[accuracyClass];
  if (!Number.isFinite(percentOfRated)) return null;
  if (percentOfRated < points[0][0] || percentOfRated > points[points.length - 1][0]) return null;
  for (let i = 1; i < points.length; i++) {
    const [x0, y0] = points[i - 1];
    const [x1, y1] = points[i];
    if (percentOfRated <= x1) return y0 + ((y1 - y0) * (percentOfRated - x0)) / (x1 - x0);
  }
  return points[points.length - 1][1];
}

/** IEC 60228:2004 class 1/2 plain copper, maximum DC resistance at 20 °C, Ω/km (secondary source). */
export const COPPER_CLASS2_OHM_PER_KM: ReadonlyArray<readonly [csaMm2: number, ohmPerKm: number]> = [
  [0.5, 36.0], [0.75, 24.5], [1.0, 18.1], [1.5, 12.1], [2.5, 7.41], [4, 4.61], [6, 3.08],
];

/**
 * Resistance per km of a lead of `csaMm2`. A section between the table's rows is taken at the next
 * smaller row (the safe side: more resistance); one below 0.5 mm² scales 0.5 mm²'s value by area.
 */
export function copperResistanceOhmPerKm(csaMm2: number): number {
  let chosen: number | null = null;
  for (const [csa, r] of COPPER_CLASS2_OHM_PER_KM) if (csa <= csaMm2 + 1e-9) chosen = r;
  if (chosen !== null) return chosen;
  const [smallest, r] = COPPER_CLASS2_OHM_PER_KM[0];
  return (r * smallest) / csaMm2;
}

/** Loop resistance of a CT's secondary leads: 2·lengthM·r/1000 Ω (out and back). */
export function leadLoopResistanceOhm(lead: { lengthM: number; csaMm2: number }): number {
  return (2 * lead.lengthM * copperResistanceOhmPerKm(lead.csaMm2)) / 1000;
}

/** Rated secondary current in A for current-output CTs, null for voltage and milliamp outputs. */
export function ratedSecondaryA(secondary: Secondary): number | null {
  if (secondary === '5A') return 5;
  if (secondary === '1A') return 1;
  return null;
}

/** Default burden of one meter current input, VA (from memory). */
export const DEFAULT_METER_INPUT_BURDEN_VA = 0.1;

/** Burden of the leads alone, I_sn²·R_loop, in VA; null for outputs other than 1 A / 5 A. */
export function leadBurdenVa(secondary: Secondary, lead: { lengthM: number; csaMm2: number }): number | null {
  const isn = ratedSecondaryA(secondary);
  if (isn === null) return null;
  return isn * isn * leadLoopResistanceOhm(lead);
}
