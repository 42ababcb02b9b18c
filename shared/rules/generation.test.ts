import { describe, expect, it } from 'vitest';
import type { GenerationGroup, ProfileId, Site } from '../site/types.ts';
import { baseSinglePhaseSite, baseSplitPhaseSite, baseThreePhaseSite, mutated, ruleFindings } from '../test-support/base-site.ts';

describe('generation-phase-invalid', () => {
  const invalid = (site: Site) => ruleFindings(site, 'generation-phase-invalid');
  const withGroup = (base: () => Site, group: GenerationGroup) => mutated(base(), (s) => { s.generation.push(group); });

  it('does not fire on groups on live conductors', () => {
    expect(invalid(baseThreePhaseSite())).toEqual([]);
    expect(invalid(baseSinglePhaseSite())).toEqual([]);
    expect(invalid(withGroup(baseSplitPhaseSite, { id: 'garage', units: 2, unitAcKw: 0.3, phase: 'L2' }))).toEqual([]);
  });

  it('fires as an error on a group on L2 of a single-phase service', () => {
    // site-format.md, "Conductors": single-phase uses L1 and N
    const found = invalid(withGroup(baseSinglePhaseSite, { id: 'shed', units: 2, unitAcKw: 0.4, phase: 'L2' }));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'generation[1].phase' });
  });

  it('fires on a group on L3 of a split-phase service', () => {
    // site-format.md, "Conductors": split-phase uses L1, L2 and N
    expect(invalid(withGroup(baseSplitPhaseSite, { id: 'shed', units: 2, unitAcKw: 0.3, phase: 'L3' }))).toHaveLength(1);
  });

  it('fires on a three-phase unit (`all`) on a single-phase service', () => {
    expect(invalid(withGroup(baseSinglePhaseSite, { id: 'string', units: 1, unitAcKw: 5, phase: 'all' }))).toHaveLength(1);
  });
});

describe('phase-imbalance', () => {
  const imbalance = (site: Site) => ruleFindings(site, 'phase-imbalance');
  const onPhases = (profile: ProfileId, groups: GenerationGroup[]) => mutated(baseThreePhaseSite(), (s) => {
    s.agreement.profile = profile;
    s.generation = groups;
  });
  const spread = (profile: ProfileId, l1Kva: number) => onPhases(profile, [
    { id: 'l1', units: 10, unitAcKw: l1Kva / 10, phase: 'L1' },
    { id: 'l2', units: 1, unitAcKw: 1, phase: 'L2' },
    { id: 'l3', units: 1, unitAcKw: 1, phase: 'L3' },
  ]);

  it('does not fire on balanced generation', () => {
    expect(imbalance(baseThreePhaseSite())).toEqual([]);
  });

  it('gb-g100: a spread of 3.68 kVA passes; 3.7 kVA is an error', () => {
    // ENA G98/G99: 16 A between phases, 16 A × 230 V = 3.68 kVA (from memory)
    expect(imbalance(spread('gb-g100', 1 + 3.68))).toEqual([]);
    const found = imbalance(spread('gb-g100', 1 + 3.7));
    expect(found).toHaveLength(1);
    expect(found[0]).toMatchObject({ severity: 'error', path: 'generation' });
  });

  it('au-4777: 5 kVA passes; 5.2 kVA is an error', () => {
    // AS/NZS 4777.1:2016: unbalance of 5 kVA per phase (secondary source)
    expect(imbalance(spread('au-4777', 6))).toEqual([]);
    expect(imbalance(spread('au-4777', 6.2))).toHaveLength(1);
  });

  it('de-4105: 4.6 kVA passes; 4.8 kVA is an error', () => {
    // VDE-AR-N 4105:2018: unbalance at most 4.6 kVA (secondary source)
    expect(imbalance(spread('de-4105', 5.6))).toEqual([]);
    expect(imbalance(spread('de-4105', 5.8))).toHaveLength(1);
  });

  it('three-phase units (`all`) are split evenly across the phases', () => {
    // rules.md phase-imbalance: `all` units split evenly. 12 kVA `all` + 3.6 kVA on L1:
    // L1 7.6, L2 4, L3 4, spread 3.6 kVA, within gb-g100's 3.68 kVA
    const site = onPhases('gb-g100', [
      { id: 'string', units: 1, unitAcKw: 12, phase: 'all' },
      { id: 'micro', units: 9, unitAcKw: 0.4, phase: 'L1' },
    ]);
    expect(imbalance(site)).toEqual([]);
    // 12 kVA on L1 alone would be a spread of 12 kVA
    expect(imbalance(onPhases('gb-g100', [{ id: 'string', units: 1, unitAcKw: 12, phase: 'L1' }]))).toHaveLength(1);
  });

  it.each(['us-pcs', 'generic'] as const)('%s has no maxImbalanceKva: an info that says "not set by this profile"', (profile) => {
    // rules.md, "Profiles": a null value means the rule is skipped, and the finding says "not set by this profile"
    const found = imbalance(spread(profile, 20));
    expect(found).toHaveLength(1);
    expect(found[0].severity).toBe('info');
    expect(found[0].message).toContain('not set by this profile');
  });

  it('split-phase compares L1 with L2', () => {
    // us-pcs sets no limit, so use gb-g100's 3.68 kVA on a split-phase site
    const site = mutated(baseSplitPhaseSite(), (s) => {
      s.agreement.profile = 'gb-g100';
      s.generation = [{ id: 'l1', units: 10, unitAcKw: 0.4, phase: 'L1' }];
    });
    expect(imbalance(site)).toHaveLength(1);
  });
});
