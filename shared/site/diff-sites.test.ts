import { describe, expect, it } from 'vitest';
import { diffSites, type SiteChange } from './diff-sites.ts';
import { baseThreePhaseSite, mutated } from '../test-support/base-site.ts';

const base = baseThreePhaseSite();
/** The order of changes is not part of the contract: compare them sorted by path. */
const sorted = (changes: SiteChange[]) => [...changes].sort((a, b) => a.path.localeCompare(b.path));

describe('diffSites', () => {
  it('finds nothing between a site and its copy', () => {
    expect(diffSites(base, structuredClone(base))).toEqual([]);
  });

  it('reports a changed field by its path, with before and after', () => {
    const after = mutated(base, (s) => { s.export.limitKw = 8; s.meter.modbus.baud = 19200; });
    expect(sorted(diffSites(base, after))).toEqual(sorted([
      { path: 'meter.modbus.baud', kind: 'changed', before: 9600, after: 19200 },
      { path: 'export.limitKw', kind: 'changed', before: 10, after: 8 },
    ]));
  });

  it('reports added and removed keys', () => {
    const after = mutated(base, (s) => { delete s.site.address; s.meter.inputBurdenVa = 0.2; });
    expect(sorted(diffSites(base, after))).toEqual(sorted([
      { path: 'site.address', kind: 'removed', before: '1 Test Row', after: null },
      { path: 'meter.inputBurdenVa', kind: 'added', before: null, after: 0.2 },
    ]));
  });

  it('matches list items by id: reordering CTs is no change', () => {
    const after = mutated(base, (s) => { s.cts.reverse(); s.generation.reverse(); });
    expect(diffSites(base, after)).toEqual([]);
  });

  it('names a changed list item by its id', () => {
    const after = mutated(base, (s) => { s.cts.reverse(); s.cts[1].ratedPrimaryA = 200; });
    expect(diffSites(base, after)).toEqual([{ path: 'cts[ct-2].ratedPrimaryA', kind: 'changed', before: 100, after: 200 }]);
  });

  it('reports an added and a removed list item by id, with the whole item', () => {
    const after = mutated(base, (s) => {
      s.generation = s.generation.filter((g) => g.id !== 'roof-l3');
      s.generation.push({ id: 'carport', units: 6, unitAcKw: 0.5, phase: 'L3' });
    });
    expect(sorted(diffSites(base, after))).toEqual(sorted([
      { path: 'generation[carport]', kind: 'added', before: null, after: { id: 'carport', units: 6, unitAcKw: 0.5, phase: 'L3' } },
      { path: 'generation[roof-l3]', kind: 'removed', before: base.generation[2], after: null },
    ]));
  });

  it('compares lists without ids by position', () => {
    const after = mutated(base, (s) => { s.gateway.bus.terminations = ['gateway', 'junction-box', 'meter']; });
    expect(diffSites(base, after)).toEqual([
      { path: 'gateway.bus.terminations[1]', kind: 'changed', before: 'meter', after: 'junction-box' },
      { path: 'gateway.bus.terminations[2]', kind: 'added', before: null, after: 'meter' },
    ]);
  });

  it('falls back to positions when ids repeat', () => {
    const before = mutated(base, (s) => { s.cts[1].id = 'ct-1'; });
    const after = mutated(before, (s) => { s.cts[1].ratedPrimaryA = 150; });
    expect(diffSites(before, after)).toEqual([{ path: 'cts[1].ratedPrimaryA', kind: 'changed', before: 100, after: 150 }]);
  });

  it('reports a section that appears as one addition', () => {
    const before = mutated(base, (s) => { delete s.commissioning; });
    expect(diffSites(before, base)).toEqual([{ path: 'commissioning', kind: 'added', before: null, after: base.commissioning }]);
  });

  it('a change of type is a change, not a walk', () => {
    const after = mutated(base, (s) => { (s.gateway.bus as unknown as Record<string, unknown>).stubs = 'none'; });
    expect(diffSites(base, after)).toEqual([{ path: 'gateway.bus.stubs', kind: 'changed', before: base.gateway.bus.stubs, after: 'none' }]);
  });

  it('with no before, everything is added, key by key at the top', () => {
    const changes = diffSites(null, base);
    expect(changes.map((c) => c.path)).toEqual(Object.keys(base));
    expect(changes.every((c) => c.kind === 'added' && c.before === null)).toBe(true);
  });

  it('does not touch its inputs', () => {
    const before = structuredClone(base);
    const after = mutated(base, (s) => { s.cts.reverse(); });
    const afterCopy = structuredClone(after);
    diffSites(before, after);
    expect(before).toEqual(base);
    expect(after).toEqual(afterCopy);
  });
});
