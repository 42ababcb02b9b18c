import type { Arrangement, LiveConductor } from '../site/types.ts';

/** The live conductors of each arrangement (site-format.md, "Conductors"). */
export function liveConductors(arrangement: Arrangement): LiveConductor[] {
  switch (arrangement) {
    case 'single-phase': return ['L1'];
    case 'split-phase': return ['L1', 'L2'];
    default: return ['L1', 'L2', 'L3'];
  }
}

export function hasNeutral(arrangement: Arrangement): boolean {
  return arrangement !== 'three-phase-3w';
}

export function isThreePhase(arrangement: Arrangement): boolean {
  return arrangement === 'three-phase-4w' || arrangement === 'three-phase-3w';
}
