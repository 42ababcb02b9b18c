// Nominal voltages, IEC 60038:2009 Table 1 (secondary source; see check-values.md).

/** √3, the ratio of line-to-line to line-to-neutral voltage in a balanced three-phase system. */
export const SQRT3 = Math.sqrt(3);

/** Nominal line-to-line voltage from line-to-neutral: √3·V_LN (three-phase), 2·V_LN (split-phase). */
export function lineToLine(voltageLn: number, arrangement: 'three-phase' | 'split-phase' = 'three-phase'): number {
  return arrangement === 'split-phase' ? 2 * voltageLn : SQRT3 * voltageLn;
}

export interface NominalSystem {
  /** Line-to-neutral voltage, V; null for a 3-wire system without neutral. */
  voltageLn: number | null;
  voltageLl: number;
  frequencyHz: 50 | 60;
  kind: 'three-phase-4w' | 'three-phase-3w' | 'split-phase' | 'single-phase';
}

/**
 * IEC 60038:2009 Table 1. 50 Hz: 230/400 and 400/690 V (4-wire), 1000 V (3-wire).
 * 60 Hz: 120/208, 240, 230/400, 277/480, 480, 347/600, 600 V; split-phase 120/240 V.
 * Single-phase services take the line-to-neutral value of a listed system (230 V at 50 Hz,
 * 120/230/277/347 V at 60 Hz): common practice.
 */
export const NOMINAL_SYSTEMS: readonly NominalSystem[] = [
  { voltageLn: 230, voltageLl: 400, frequencyHz: 50, kind: 'three-phase-4w' },
  { voltageLn: 400, voltageLl: 690, frequencyHz: 50, kind: 'three-phase-4w' },
  { voltageLn: null, voltageLl: 400, frequencyHz: 50, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 690, frequencyHz: 50, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 1000, frequencyHz: 50, kind: 'three-phase-3w' },
  { voltageLn: 120, voltageLl: 208, frequencyHz: 60, kind: 'three-phase-4w' },
  { voltageLn: 230, voltageLl: 400, frequencyHz: 60, kind: 'three-phase-4w' },
  { voltageLn: 277, voltageLl: 480, frequencyHz: 60, kind: 'three-phase-4w' },
  { voltageLn: 347, voltageLl: 600, frequencyHz: 60, kind: 'three-phase-4w' },
  { voltageLn: null, voltageLl: 208, frequencyHz: 60, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 240, frequencyHz: 60, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 400, frequencyHz: 60, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 480, frequencyHz: 60, kind: 'three-phase-3w' },
  { voltageLn: null, voltageLl: 600, frequencyHz: 60, kind: 'three-phase-3w' },
  { voltageLn: 120, voltageLl: 240, frequencyHz: 60, kind: 'split-phase' },
  { voltageLn: 230, voltageLl: 230, frequencyHz: 50, kind: 'single-phase' },
  { voltageLn: 120, voltageLl: 120, frequencyHz: 60, kind: 'single-phase' },
  { voltageLn: 230, voltageLl: 230, frequencyHz: 60, kind: 'single-phase' },
  { voltageLn: 240, voltageLl: 240, frequencyHz: 60, kind: 'single-phase' },
  { voltageLn: 277, voltageLl: 277, frequencyHz: 60, kind: 'single-phase' },
  { voltageLn: 347, voltageLl: 347, frequencyHz: 60, kind: 'single-phase' },
];

/** Nominal pairs are rounded (230·√3 = 398.4), so ratios are compared with 2 % slack (check-values.md). */
export const VOLTAGE_RATIO_TOLERANCE = 0.02;

/** Relative deviation of `actual` from `expected`: |actual − expected| / expected. */
export function relativeDeviation(actual: number, expected: number): number {
  return Math.abs(actual - expected) / expected;
}
