import { NOMINAL_SYSTEMS, SQRT3, VOLTAGE_RATIO_TOLERANCE, relativeDeviation } from '../electrical/voltage.ts';
import { defineRule, fmt } from './rule.ts';

const IEC60038 = 'IEC 60038:2009 Table 1';

export const serviceVoltageRatio = defineRule({
  id: 'service-voltage-ratio',
  severity: 'error',
  title: 'Line-to-line voltage agrees with line-to-neutral (√3 for three-phase, 2 for split-phase)',
  source: `${IEC60038}; V_LL = √3·V_LN, 2 % tolerance`,
  check({ site }) {
    const { arrangement, voltageLn, voltageLl } = site.service;
    if (voltageLn === undefined || voltageLl === undefined) return [];
    let factor: number;
    let label: string;
    if (arrangement === 'three-phase-4w') { factor = SQRT3; label = '√3'; }
    else if (arrangement === 'split-phase') { factor = 2; label = '2'; }
    else return [];
    const expected = factor * voltageLn;
    const deviation = relativeDeviation(voltageLl, expected);
    if (!(deviation > VOLTAGE_RATIO_TOLERANCE)) return [];
    return [{
      at: ['service', 'voltageLl'],
      message: `voltageLl ${fmt(voltageLl)} V is ${fmt(deviation * 100, 1)} % off ${label}·voltageLn = ${fmt(expected, 1)} V (more than ${VOLTAGE_RATIO_TOLERANCE * 100} %)`,
      hint: arrangement === 'split-phase' ? 'a 120/240 V split-phase service has voltageLn 120 and voltageLl 240' : 'for example 230/400 V or 120/208 V',
    }];
  },
});

function matches(a: number | null | undefined, b: number | null): boolean {
  if (a === undefined || a === null || b === null) return false;
  return relativeDeviation(a, b) <= 0.01;
}

export const serviceVoltageNonstandard = defineRule({
  id: 'service-voltage-nonstandard',
  severity: 'warning',
  title: 'The nominal voltage and frequency are one of IEC 60038\'s',
  source: IEC60038,
  check({ site }) {
    const { arrangement, voltageLn, voltageLl, frequencyHz } = site.service;
    const atFrequency = NOMINAL_SYSTEMS.filter((s) => s.frequencyHz === frequencyHz);
    let ok: boolean;
    let shown: string;
    if (arrangement === 'three-phase-4w') {
      ok = atFrequency.some((s) => s.kind === 'three-phase-4w' && matches(voltageLn, s.voltageLn) && matches(voltageLl, s.voltageLl));
      shown = `${fmt(voltageLn ?? NaN)}/${fmt(voltageLl ?? NaN)} V`;
    } else if (arrangement === 'three-phase-3w') {
      ok = atFrequency.some((s) => (s.kind === 'three-phase-3w' || s.kind === 'three-phase-4w') && matches(voltageLl, s.voltageLl));
      shown = `${fmt(voltageLl ?? NaN)} V (3-wire)`;
    } else if (arrangement === 'split-phase') {
      ok = atFrequency.some((s) => s.kind === 'split-phase' && matches(voltageLn, s.voltageLn) && matches(voltageLl, s.voltageLl));
      shown = `${fmt(voltageLn ?? NaN)}/${fmt(voltageLl ?? NaN)} V split-phase`;
    } else {
      ok = atFrequency.some((s) => s.kind === 'single-phase' && matches(voltageLn, s.voltageLn));
      shown = `${fmt(voltageLn ?? NaN)} V single-phase`;
    }
    if (ok) return [];
    return [{
      at: ['service', arrangement !== 'three-phase-3w' && voltageLn !== undefined ? 'voltageLn' : 'voltageLl'],
      message: `${shown} at ${frequencyHz} Hz is not a nominal system of IEC 60038 Table 1`,
      hint: frequencyHz === 50 ? 'at 50 Hz the usual low-voltage system is 230/400 V' : 'at 60 Hz: 120/208, 120/240 (split-phase), 277/480 or 347/600 V',
    }];
  },
});

export const serviceRules = [serviceVoltageRatio, serviceVoltageNonstandard];
