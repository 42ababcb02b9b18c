// The engine in-process: sites per second through runRules on parsed documents and through the
// whole checkSite, the time per site of each step (YAML, schema, rules, summary), and a CPU
// profile of checkSite summarised to its top functions. Reported, with no budget.
import { mkdirSync, rmSync } from 'node:fs';
import { join, relative } from 'node:path';
import { LineCounter, parseDocument } from 'yaml';
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
  const docs = texts.map((t) => parseDocument(t, { version: '1.2' }));

  const perSite = (ms: number) => (ms * 1000) / count; // µs per site
  const steps: [string, () => void][] = [
    ['YAML: parseDocument', () => { for (const t of texts) parseDocument(t, { lineCounter: new LineCounter(), uniqueKeys: true, prettyErrors: false, strict: true, version: '1.2' }); }],
    ['YAML: document to data (toJS)', () => { for (const d of docs) d.toJS({ maxAliasCount: 100 }); }],
    ['schema: validateSite', () => { for (const d of datas) validateSite(d); }],
    ['parseSite (YAML + schema)', () => { for (const t of texts) parseSite(t); }],
    ['rules: runRules with locator', () => { for (const p of sites) runRules(p.site as Site, p.locate); }],
    ['summary: summarizeSite', () => { for (const p of sites) summarizeSite(p.site as Site); }],
    ['checkSite (all of it)', () => { for (const t of texts) checkSite(t); }],
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
  const timed = new Map([...samples].map(([name, v]) => [name, median(v)]));
  const total = timed.get('checkSite (all of it)')!;

  const rulesMs = timed.get('rules: runRules with locator')!;
  const figures: Figure[] = [
    { bench: BENCH, figure: 'runRules on parsed sites', value: `${fmt.int((count / rulesMs) * 1000)} sites/s`, result: 'INFO', note: `${count} generated sites, median of ${runs} rounds` },
    { bench: BENCH, figure: 'checkSite (YAML + schema + rules + summary)', value: `${fmt.int((count / total) * 1000)} sites/s`, result: 'INFO' },
  ];
  for (const [name] of steps) {
    if (name === 'checkSite (all of it)') continue;
    const ms = timed.get(name)!;
    figures.push({ bench: BENCH, figure: `  ${name}`, value: `${perSite(ms).toFixed(0)} µs/site`, ratio: `${((ms / total) * 100).toFixed(0)} %`, result: 'INFO' });
  }
  figures.at(-1)!.note = 'ratio column: share of checkSite\'s time';

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
