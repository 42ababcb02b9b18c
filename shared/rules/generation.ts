import { generationPerPhaseKva } from '../site/summary.ts';
import { defineRule, fmt, type RawFinding } from './rule.ts';

export const generationPhaseInvalid = defineRule({
  id: 'generation-phase-invalid',
  severity: 'error',
  title: 'Every generation group is on a live conductor of the service',
  check({ site, live }) {
    return site.generation.flatMap((g, i): RawFinding[] => {
      const ok = g.phase === 'all' ? live.length >= 2 : live.includes(g.phase);
      if (ok) return [];
      return [{
        at: ['generation', i, 'phase'],
        message: g.phase === 'all'
          ? `generation ${g.id} is a multi-phase unit, but a ${site.service.arrangement} service has only ${live.join(', ')}`
          : `generation ${g.id} is on ${g.phase}, which is not a live conductor of a ${site.service.arrangement} service (${live.join(', ')})`,
      }];
    });
  },
});

export const phaseImbalance = defineRule({
  id: 'phase-imbalance',
  severity: 'error',
  title: 'Generation is balanced across the phases within the profile\'s limit',
  check({ site, live, profile }) {
    if (live.length < 2) return [];
    const perPhase = generationPerPhaseKva(site);
    const values = live.map((c) => perPhase[c]);
    const spread = Math.max(...values) - Math.min(...values);
    if (profile.maxImbalanceKva === null) {
      return [{ at: ['generation'], severity: 'info', message: `phase imbalance not checked: a limit is not set by this profile (${profile.id}); the spread is ${fmt(spread, 3)} kVA`, source: profile.sources.maxImbalanceKva }];
    }
    if (!(spread > profile.maxImbalanceKva + 1e-9)) return [];
    return [{
      at: ['generation'],
      message: `generation differs by ${fmt(spread, 3)} kVA between phases (${live.map((c) => `${c} ${fmt(perPhase[c], 3)}`).join(', ')} kVA); profile ${profile.id} allows ${fmt(profile.maxImbalanceKva, 3)} kVA`,
      hint: 'move units from the heaviest phase to the lightest',
      source: profile.sources.maxImbalanceKva,
    }];
  },
});

export const generationRules = [generationPhaseInvalid, phaseImbalance];
