import { phaseAngleDeg, powerFactorMagnitude } from '../electrical/power.ts';
import type { Expect, LiveConductor, Reading, Site } from '../site/types.ts';
import { defineRule, fmt, type RawFinding } from './rule.ts';

const PHASES: LiveConductor[] = ['L1', 'L2', 'L3'];
/** |PF| at or above which a reading's sign is trusted (common practice). */
export const REVERSED_MIN_PF = 0.8;
/** Cross-phase angles: a current paired with another phase's voltage is off by ±120° (±60° if also reversed). IEEE Std 1459 phasors; common practice. */
export const CROSS_PHASE_ANGLES = [120, -120, 60, -60];
export const CROSS_PHASE_WINDOW_DEG = 15;
/** cos 60° = 0.5: with only |PF| known, 0.35–0.65 suggests a 120°/60° error (common practice). */
export const CROSS_PHASE_PF_BAND = [0.35, 0.65] as const;

interface PhaseReading {
  i: number;
  phase: LiveConductor;
  reading: Reading;
  expect: Expect;
  label: string;
}

/** Every conductor's reading in every snapshot, with where it sits in the file. */
function eachReading(site: Site): PhaseReading[] {
  const out: PhaseReading[] = [];
  (site.commissioning?.readings ?? []).forEach((snapshot, i) => {
    for (const phase of PHASES) {
      const reading = snapshot[phase];
      if (reading) out.push({ i, phase, reading, expect: snapshot.expect, label: snapshot.label });
    }
  });
  return out;
}

export const readingVoltageMissing = defineRule({
  id: 'reading-voltage-missing',
  severity: 'error',
  title: 'Each reading shows the supply voltage',
  check({ site, voltageLn }) {
    return eachReading(site).flatMap(({ i, phase, reading, label }): RawFinding[] => reading.v < 0.5 * voltageLn ? [{
      at: ['commissioning', 'readings', i, phase, 'v'],
      message: `${label}: ${phase} reads ${fmt(reading.v, 1)} V, less than half of ${fmt(voltageLn, 1)} V: the voltage input is not connected`,
      hint: 'check the voltage input\'s fuse and wiring',
    }] : []);
  },
});

export const readingCtReversed = defineRule({
  id: 'reading-ct-reversed',
  severity: 'error',
  title: 'Readings show power in the expected direction',
  source: 'common practice: a CT facing the wrong way inverts the power sign',
  check({ site }) {
    return eachReading(site).flatMap(({ i, phase, reading, expect, label }): RawFinding[] => {
      if (expect === 'any') return [];
      const pf = powerFactorMagnitude(reading);
      if (pf === null || pf < REVERSED_MIN_PF) return [];
      const wrong = expect === 'import' ? reading.kw < 0 : reading.kw > 0;
      if (!wrong) return [];
      return [{
        at: ['commissioning', 'readings', i, phase, 'kw'],
        message: `${label}: ${phase} shows ${fmt(reading.kw, 3)} kW (${reading.kw < 0 ? 'export' : 'import'}) at |PF| ${fmt(pf, 2)} where ${expect} was expected: the CT on ${phase} faces the wrong way`,
        hint: `turn the CT on ${phase} round (arrow toward the load)`,
      }];
    });
  },
});

export const readingCrossPhase = defineRule({
  id: 'reading-cross-phase',
  severity: 'error',
  title: 'Each reading\'s current and voltage come from the same phase',
  source: 'IEEE Std 1459-2010 phasor relations; common practice',
  check({ site }) {
    return eachReading(site).flatMap(({ i, phase, reading, label }): RawFinding[] => {
      const angle = phaseAngleDeg(reading);
      if (angle !== null) {
        const near = CROSS_PHASE_ANGLES.find((a) => Math.abs(angle - a) <= CROSS_PHASE_WINDOW_DEG);
        if (near === undefined) return [];
        return [{
          at: ['commissioning', 'readings', i, phase],
          message: `${label}: ${phase} has a phase angle of ${fmt(angle, 1)}°, within ${CROSS_PHASE_WINDOW_DEG}° of ${near}°: its current and voltage come from different phases`,
          hint: 'check that the CT on this conductor feeds the current input paired with its voltage input',
        }];
      }
      const pf = powerFactorMagnitude(reading);
      if (pf === null || pf < CROSS_PHASE_PF_BAND[0] || pf > CROSS_PHASE_PF_BAND[1]) return [];
      return [{
        at: ['commissioning', 'readings', i, phase],
        severity: 'warning',
        message: `${label}: ${phase} has |PF| ${fmt(pf, 2)}, close to cos 60° = 0.5: its current and voltage may come from different phases`,
        hint: 'record kvar as well to confirm the phase angle',
      }];
    });
  },
});

export const exportTestFailed = defineRule({
  id: 'export-test-failed',
  severity: 'error',
  title: 'The export test stayed within the limit and the profile\'s tolerance',
  check({ site, profile }) {
    const test = site.commissioning?.exportTest;
    if (!test) return [];
    const allowed = site.export.limitKw * (1 + profile.exportTolerance);
    if (!(test.observedMaxKw > allowed + 1e-9)) return [];
    return [{
      at: ['commissioning', 'exportTest', 'observedMaxKw'],
      message: `the export test saw ${fmt(test.observedMaxKw, 3)} kW, more than ${fmt(allowed, 3)} kW (limit ${fmt(site.export.limitKw, 3)} kW + ${fmt(profile.exportTolerance * 100)} % tolerance of ${profile.id})`,
      source: profile.sources.exportTolerance,
    }];
  },
});

export const failsafeTestFailed = defineRule({
  id: 'failsafe-test-failed',
  severity: 'error',
  title: 'The fail-safe test acted within the configured delay',
  check({ site }) {
    const test = site.commissioning?.failSafeTest;
    if (!test || !(test.observedS > site.export.failSafe.afterS)) return [];
    return [{
      at: ['commissioning', 'failSafeTest', 'observedS'],
      message: `the fail-safe acted after ${fmt(test.observedS)} s, later than the configured ${fmt(site.export.failSafe.afterS)} s`,
    }];
  },
});

export const commissioningMissing = defineRule({
  id: 'commissioning-missing',
  severity: 'info',
  title: 'The site has commissioning evidence',
  check({ site }) {
    if (site.commissioning) return [];
    return [{ at: [], message: 'there is no commissioning section: the site is not evidenced yet' }];
  },
});

export const commissioningRules = [readingVoltageMissing, readingCtReversed, readingCrossPhase, exportTestFailed, failsafeTestFailed, commissioningMissing];
