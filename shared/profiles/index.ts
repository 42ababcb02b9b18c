// Grid-rule profiles are data (rules.md, "Profiles"): one JSON file each, naming its sources.
import type { ProfileId } from '../site/types.ts';
import gbG100 from './gb-g100.json';
import au4777 from './au-4777.json';
import de4105 from './de-4105.json';
import usPcs from './us-pcs.json';
import generic from './generic.json';

export interface Profile {
  id: ProfileId;
  title: string;
  /** Longest fail-safe delay the rules allow, s; null: not set by this profile. */
  maxResponseS: number | null;
  /** Largest generation imbalance between phases, kVA; null: not set by this profile. */
  maxImbalanceKva: number | null;
  /** Share over the limit that an export test may show, e.g. 0.1 = 110 %. */
  exportTolerance: number;
  sources: Record<'maxResponseS' | 'maxImbalanceKva' | 'exportTolerance', string>;
}

export const PROFILES: Record<ProfileId, Profile> = {
  'gb-g100': gbG100 as Profile,
  'au-4777': au4777 as Profile,
  'de-4105': de4105 as Profile,
  'us-pcs': usPcs as Profile,
  generic: generic as Profile,
};

export function getProfile(id: ProfileId): Profile {
  return PROFILES[id] ?? PROFILES.generic;
}
