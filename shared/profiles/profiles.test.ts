import { describe, expect, it } from 'vitest';
import { PROFILES, getProfile } from './index.ts';

describe('grid-rule profiles', () => {
  it('gb-g100: 15 s, 3.68 kVA, no tolerance', () => {
    // ENA EREC G100 Issue 2: typically within 15 s (secondary source); 16 A × 230 V = 3.68 kVA, G98/G99 (from memory)
    expect(PROFILES['gb-g100']).toMatchObject({ maxResponseS: 15, maxImbalanceKva: 3.68, exportTolerance: 0 });
    expect(16 * 230 / 1000).toBeCloseTo(3.68, 10);
  });

  it('au-4777: 15 s, 5 kVA, no tolerance', () => {
    // AS/NZS 4777.1:2016 cl. 3.4.8; 5 kVA unbalance (secondary source); 15 s (from memory)
    expect(PROFILES['au-4777']).toMatchObject({ maxResponseS: 15, maxImbalanceKva: 5, exportTolerance: 0 });
  });

  it('de-4105: no response time, 4.6 kVA, no tolerance', () => {
    // VDE-AR-N 4105:2018: unbalance at most 4.6 kVA (secondary source)
    expect(PROFILES['de-4105']).toMatchObject({ maxResponseS: null, maxImbalanceKva: 4.6, exportTolerance: 0 });
  });

  it('us-pcs: 30 s, no imbalance limit, 110 %', () => {
    // UL 1741 PCS requirement decision: open-loop ≤ 30 s; inadvertent export ≤ 110 % (secondary source)
    expect(PROFILES['us-pcs']).toMatchObject({ maxResponseS: 30, maxImbalanceKva: null, exportTolerance: 0.1 });
  });

  it('generic: nothing set, 5 % tolerance', () => {
    // rules.md: our own default, from memory
    expect(PROFILES.generic).toMatchObject({ maxResponseS: null, maxImbalanceKva: null, exportTolerance: 0.05 });
  });

  it('every profile names a source for each value, and null values say "not set by this profile"', () => {
    for (const profile of Object.values(PROFILES)) {
      for (const key of ['maxResponseS', 'maxImbalanceKva', 'exportTolerance'] as const) {
        expect(profile.sources[key], `${profile.id}.${key}`).toMatch(/\S/);
        if (profile[key] === null) expect(profile.sources[key]).toContain('not set by this profile');
      }
    }
  });

  it('the five ids of site-format.md, each under its own id', () => {
    // site-format.md: profile gb-g100 | au-4777 | de-4105 | us-pcs | generic
    expect(Object.keys(PROFILES).sort()).toEqual(['au-4777', 'de-4105', 'gb-g100', 'generic', 'us-pcs']);
    for (const [id, p] of Object.entries(PROFILES)) {
      expect(p.id).toBe(id);
      expect(getProfile(id as 'generic')).toBe(p);
    }
  });
});
