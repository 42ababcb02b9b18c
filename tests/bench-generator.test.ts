// The benchmarks' site-file generator: the same seed gives the same files, every file is a valid
// site file (so every rule runs on it in `weir check`), and the files vary enough to exercise
// the rules rather than repeat one site.
import { describe, expect, it } from 'vitest';
import { checkSite, parseSite } from '../shared/index.ts';
import { createRng, generateSites, loadBases } from '../bench/generate-sites.ts';

describe('bench site generator', () => {
  const bases = loadBases();

  it('when given the same seed twice, then it writes the same files', () => {
    const a = generateSites(40, 11, bases);
    const b = generateSites(40, 11, bases);
    expect(b).toEqual(a);
  });

  it('when given another seed, then the files differ', () => {
    const a = generateSites(10, 11, bases).map((s) => s.text);
    const b = generateSites(10, 12, bases).map((s) => s.text);
    expect(b.filter((t, i) => t === a[i])).toHaveLength(0);
  });

  it('when asked for files from an offset, then file i is the same as in a run from 0', () => {
    const whole = generateSites(30, 5, bases);
    const tail = generateSites(10, 5, bases, 20);
    expect(tail).toEqual(whole.slice(20));
  });

  it('when generating, then every file passes the YAML and schema stage, under a unique id and matching file name', () => {
    const sites = generateSites(200, 3, bases);
    const ids = new Set<string>();
    for (const s of sites) {
      const parsed = parseSite(s.text);
      expect(parsed.findings.filter((f) => f.severity === 'error'), s.file).toEqual([]);
      expect(parsed.site?.site.id).toBe(s.id);
      expect(s.file).toBe(`${s.id}.yaml`);
      ids.add(s.id);
    }
    expect(ids.size).toBe(sites.length);
  });

  it('when generating many files, then the rules find a spread of different things', () => {
    const ruleIds = new Set<string>();
    let clean = 0;
    const sites = generateSites(300, 9, bases);
    for (const s of sites) {
      const { findings } = checkSite(s.text);
      if (findings.every((f) => f.severity !== 'error')) clean++;
      for (const f of findings) ruleIds.add(f.ruleId);
    }
    // The generator plants a reversed CT, a limit typed in W, a long bus, a baud mismatch and a
    // slow fail-safe in a few files each. Some bases (the demo fleet's faulty examples) carry a
    // fault of their own, so about half the files have an error; the rest must stay clean, or
    // the rules would not be timed on good sites at all.
    for (const id of ['ct-arrow-toward-grid', 'export-limit-over-agreement', 'bus-too-long', 'bus-baud-mismatch', 'failsafe-too-slow']) expect(ruleIds, id).toContain(id);
    expect(clean).toBeGreaterThan(sites.length / 3);
  });

  it('when seeded, then the random stream repeats and stays in [0, 1)', () => {
    const a = createRng(42);
    const b = createRng(42);
    const values = Array.from({ length: 1000 }, () => a.next());
    expect(Array.from({ length: 1000 }, () => b.next())).toEqual(values);
    expect(Math.min(...values)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...values)).toBeLessThan(1);
    expect(new Set(values).size).toBe(1000);
  });
});
