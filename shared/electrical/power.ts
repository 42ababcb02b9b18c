// Power relations. IEEE Std 1459-2010 for P, Q, S and PF; the three-phase relation
// P = √3·V_LL·I·PF is the textbook one (worked examples in check-values.md).
import { SQRT3 } from './voltage.ts';

/** Three-phase active power in W: √3·V_LL·I·PF. */
export function threePhasePowerW(voltageLl: number, currentA: number, powerFactor = 1): number {
  return SQRT3 * voltageLl * currentA * powerFactor;
}

/** Line current in A that carries `powerW` in a balanced three-phase system: P/(√3·V_LL·PF). */
export function threePhaseCurrentA(powerW: number, voltageLl: number, powerFactor = 1): number {
  return powerW / (SQRT3 * voltageLl * powerFactor);
}

/** |PF| = |P|/(V·I) for one conductor, from a meter snapshot (kw in kW). Null when V·I is 0. */
export function powerFactorMagnitude(reading: { v: number; a: number; kw: number }): number | null {
  const apparentVa = reading.v * reading.a;
  if (!(apparentVa > 0) || !Number.isFinite(apparentVa)) return null;
  return Math.abs(reading.kw * 1000) / apparentVa;
}

/** Phase angle φ = atan2(Q, P) in degrees, in (−180, 180]; null without kvar. */
export function phaseAngleDeg(reading: { kw: number; kvar?: number }): number | null {
  if (reading.kvar === undefined) return null;
  return (Math.atan2(reading.kvar, reading.kw) * 180) / Math.PI;
}

/** Vector apparent power S_V = √(P² + Q²) (IEEE Std 1459-2010), with P and Q summed over phases. */
export function vectorApparentPower(p: number, q: number): number {
  return Math.hypot(p, q);
}
