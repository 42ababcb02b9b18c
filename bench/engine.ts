// The engine in-process: sites per second through runRules on parsed documents and through the
// whole checkSite, the time per site of each step (YAML, schema, rules, summary), and a CPU
// profile of checkSite summarised to its top functions. Reported, with no budget.
import { mkdirSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import { checkSite, parseSite, runRules, summarizeSite, type Site } from '../shared/index.ts';
import { validateSite } from '../shared/site/site-validator.generated.js';
import { generateSites, type BaseSite } from './generate-sites.ts';
import { outDir, repoRoot, run } from './lib/processes.ts';
import { summariseProfile } from './lib/profile.ts';
import type { Figure } from './lib/report.ts';
import { fmt, median } from './lib/stats.ts';

const BENCH = 'engine';

export interface EngineResult {
  figures: Figure[];
  /** Lines of text for the report: the profile's top functions. */
  profile: string[];
}

export async function benchEngine({ count, runs, seed, bases }: { count: number; runs: number; seed: number; bases: BaseSite[] }): Promise<EngineResult> {
  const texts = generateSites(count, seed, bases).map((s) => s.text);
  const parsed = texts.map((t) => parseSite(t));
  const sites = parsed.filter((p) => p.site);
  if (sites.length !== texts.length) throw new Error(`${texts.length - sites.length} generated files failed the schema`);
  const datas = parsed.map((p) => p.data);

  const perSite = (ms: number) => (ms * 1000) / count; // µs per site
  // Only the engine's public entry points (and the generated validator on its own), so the split
  // stays right whatever parseSite does inside; the profile below shows the inside.
  const steps: [string, () => void][] = [
    ['parseSite', () => { for (const t of texts) parseSite(t); }],
    ['validateSite', () => { for (const d of datas) validateSite(d); }],
    ['runRules', () => { for (const p of sites) runRules(p.site as Site, p.locate); }],
    ['summarizeSite', () => { for (const p of sites) summarizeSite(p.site as Site); }],
    ['checkSite', () => { for (const t of texts) checkSite(t); }],
  ];
  // Round-robin: each round runs every step once, so drift in the machine's speed hits all alike.
  const samples = new Map<string, number[]>(steps.map(([name]) => [name, []]));
  for (const [, fn] of steps) fn(); // warm-up
  for (let r = 0; r < runs; r++) {
    for (const [name, fn] of steps) {
      const t0 = performance.now();
      fn();
      samples.get(name)!.push(performance.now() - t0);
    }
  }
  const ms = Object.fromEntries([...samples].map(([name, v]) => [name, median(v)])) as Record<string, number>;
  // The parts of checkSite, each timed on its own; shares are of their sum, which is close to
  // checkSite's own time (timed separately, so the two differ by noise).
  const parts: [string, number][] = [
    ['YAML and positions (parseSite − schema)', Math.max(0, ms.parseSite - ms.validateSite)],
    ['schema (the generated validator)', ms.validateSite],
    ['rules (runRules)', ms.runRules],
    ['summary (summarizeSite)', ms.summarizeSite],
  ];
  const sum = parts.reduce((a, [, v]) => a + v, 0);

  const figures: Figure[] = [
    { bench: BENCH, figure: 'runRules on parsed sites', value: `${fmt.int((count / ms.runRules) * 1000)} sites/s`, result: 'INFO', note: `${count} generated sites, median of ${runs} rounds` },
    { bench: BENCH, figure: 'checkSite (YAML + schema + rules + summary)', value: `${fmt.int((count / ms.checkSite) * 1000)} sites/s`, result: 'INFO', note: `${perSite(ms.checkSite).toFixed(0)} µs/site; the rows below time its parts, ratio column = share of their sum (${perSite(sum).toFixed(0)} µs/site)` },
    ...parts.map(([figure, v]): Figure => ({ bench: BENCH, figure: `  ${figure}`, value: `${perSite(v).toFixed(0)} µs/site`, ratio: `${((v / sum) * 100).toFixed(0)} %`, result: 'INFO' })),
  ];

  const profile = await profileCheckSite(count, seed);
  return { figures, profile };
}

/** Profiles checkSite in a child (only the checking, not the generating) and lists where the time went. */
async function profileCheckSite(count: number, seed: number): Promise<string[]> {
  const dir = join(outDir, 'profile');
  rmSync(dir, { recursive: true, force: true });
  mkdirSync(dir, { recursive: true });
  const file = join(dir, 'check-site.cpuprofile');
  const result = await run(process.execPath, ['--import', 'tsx', join(repoRoot, 'bench/engine-profile.ts'), String(count), String(seed), file], { timeoutMs: 120_000 });
  if (result.code !== 0) return [`(profile failed: exit ${result.code} ${result.stderrHead.slice(0, 300)})`];
  return [`CPU profile of checkSite, ${count} sites × several rounds (open ${relative(repoRoot, file)} in Chrome DevTools for the tree):`, ...summariseProfile(file)];
}
