import { hasNeutral } from '../electrical/conductors.ts';
import type { CurrentTerminal, VoltageTerminal } from '../site/types.ts';
import { defineRule, type RawFinding } from './rule.ts';

const PAIRS: ReadonlyArray<readonly [VoltageTerminal, CurrentTerminal]> = [['V1', 'I1'], ['V2', 'I2'], ['V3', 'I3']];

export const meterPositionFeeder = defineRule({
  id: 'meter-position-feeder',
  severity: 'error',
  title: 'The export meter sits at the grid connection point',
  source: 'common practice: the meter must see the net flow at the grid connection point',
  check({ site }) {
    if (site.meter.position !== 'generation-feeder' || site.export.control !== 'enabled') return [];
    return [{
      at: ['meter', 'position'],
      message: 'the meter is on the generation feeder, so the gateway cannot see the site\'s net export',
      hint: 'fit the meter and its CTs at the grid connection point, upstream of every load and generator',
    }];
  },
});

export const meterVoltageWiring = defineRule({
  id: 'meter-voltage-wiring',
  severity: 'error',
  title: 'The voltage inputs take each live conductor once, and N where there is one',
  check({ site, live }) {
    const inputs = site.meter.voltageInputs;
    const wired = (['V1', 'V2', 'V3'] as const).map((t) => inputs[t]).filter((c) => c !== undefined);
    const problems: string[] = [];
    for (const c of live) {
      const times = wired.filter((w) => w === c).length;
      if (times === 0) problems.push(`${c} is on no voltage input`);
      else if (times > 1) problems.push(`${c} is on ${times} voltage inputs`);
    }
    for (const w of new Set(wired)) {
      if (!(live as string[]).includes(w)) problems.push(`a voltage input is wired to ${w}, which is not a live conductor of a ${site.service.arrangement} service`);
    }
    const neutral = hasNeutral(site.service.arrangement);
    if (neutral && inputs.N !== 'N') problems.push(inputs.N === undefined ? 'the neutral input is not wired to N' : `the neutral input is wired to ${inputs.N}`);
    if (!neutral && inputs.N !== undefined) problems.push('a three-phase-3w service has no neutral, but the meter\'s N input is wired');
    if (problems.length === 0) return [];
    return [{ at: ['meter', 'voltageInputs'], message: `voltage inputs: ${problems.join('; ')}`, hint: `expected ${live.map((c, i) => `V${i + 1}: ${c}`).join(', ')}${neutral ? ', N: N' : ''}` }];
  },
});

export const meterCtMissing = defineRule({
  id: 'meter-ct-missing',
  severity: 'error',
  title: 'Every live conductor has a current input',
  check({ site, live }) {
    const clamped = new Set(Object.values(site.meter.currentInputs).map((i) => i?.conductor));
    return live.filter((c) => !clamped.has(c)).map((c): RawFinding => ({
      at: ['meter', 'currentInputs'],
      message: `no CT measures ${c}: the gateway cannot see export on that conductor`,
      hint: 'fit a CT on every live conductor at the grid connection point',
    }));
  },
});

export const meterCtUnknown = defineRule({
  id: 'meter-ct-unknown',
  severity: 'error',
  title: 'Every current input names a CT in cts',
  check({ site }) {
    const ids = new Set(site.cts.map((c) => c.id));
    const out: RawFinding[] = [];
    for (const [, terminal] of PAIRS) {
      const input = site.meter.currentInputs[terminal];
      if (input && !ids.has(input.ct)) {
        out.push({ at: ['meter', 'currentInputs', terminal, 'ct'], message: `current input ${terminal} names CT \`${input.ct}\`, which is not in cts`, hint: `known CTs: ${[...ids].join(', ')}` });
      }
    }
    return out;
  },
});

export const meterCtPhasePair = defineRule({
  id: 'meter-ct-phase-pair',
  severity: 'error',
  title: 'Each current input is on the same conductor as its voltage input',
  source: 'site-format.md: voltage input Vk pairs with current input Ik',
  check({ site }) {
    const out: RawFinding[] = [];
    for (const [vt, it] of PAIRS) {
      const input = site.meter.currentInputs[it];
      if (!input) continue;
      const voltage = site.meter.voltageInputs[vt];
      if (voltage === input.conductor) continue;
      out.push({
        at: ['meter', 'currentInputs', it, 'conductor'],
        message: voltage === undefined
          ? `current input ${it} is clamped on ${input.conductor}, but ${vt} is not wired`
          : `current input ${it} is clamped on ${input.conductor}, but ${vt} is wired to ${voltage}: the meter multiplies a current by the wrong voltage`,
        hint: `move the CT to ${voltage ?? 'the conductor of ' + vt}, or rewire ${vt} to ${input.conductor}`,
      });
    }
    return out;
  },
});

export const meterRules = [meterPositionFeeder, meterVoltageWiring, meterCtMissing, meterCtUnknown, meterCtPhasePair];
