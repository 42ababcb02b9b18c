// Summaries of V8 CPU profiles (the .cpuprofile format of --cpu-prof and the inspector): self
// time by area of the code and by function.
import { readFileSync } from 'node:fs';
import { relative } from 'node:path';
import { repoRoot } from './processes.ts';

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  children?: number[];
}
export interface CpuProfile {
  nodes: ProfileNode[];
  samples: number[];
  timeDeltas: number[];
}

/** Which part of the code a frame belongs to, for the by-area summary. */
export function areaOf(url: string, fn: string): string {
  if (fn === '(garbage collector)') return 'garbage collector';
  if (fn === '(idle)') return 'idle';
  if (fn === '(program)') return 'program (native, unattributed)';
  const pkg = url.match(/\/node_modules\/((?:@[^/]+\/)?[^/]+)\//);
  if (pkg) return `package ${pkg[1]}`;
  if (url.includes('site-validator.generated')) return 'schema validator';
  const own = url.match(/\/(shared|server|cli|bench)\/([^/]+)\//);
  if (own) return `${own[1]}/${own[2]}`;
  if (url.startsWith('node:') || url === '') return 'node internals';
  return relative(repoRoot, url.replace(/^file:\/\//, ''));
}

/**
 * Self time per area and per function, as report lines. `areas` maps a frame to an area; a
 * bundle (dist/server.js) has no package paths, so its frames all land in one area.
 */
export function summariseProfile(profile: CpuProfile | string, { top = 15, areas = areaOf, skipIdle = true, ownTop = 0 } = {}): string[] {
  const prof: CpuProfile = typeof profile === 'string' ? JSON.parse(readFileSync(profile, 'utf8')) : profile;
  const byId = new Map(prof.nodes.map((n) => [n.id, n]));
  const selfUs = new Map<number, number>();
  for (let i = 0; i < prof.samples.length; i++) selfUs.set(prof.samples[i], (selfUs.get(prof.samples[i]) ?? 0) + (prof.timeDeltas[i] ?? 0));
  const fnTotals = new Map<string, number>();
  const areaTotals = new Map<string, number>();
  let total = 0;
  for (const [id, us] of selfUs) {
    const { functionName, url, lineNumber } = byId.get(id)!.callFrame;
    if (skipIdle && functionName === '(idle)') continue;
    total += us;
    const where = url.startsWith('file://') ? relative(repoRoot, new URL(url).pathname) : url || '(native)';
    const key = `${functionName || '(anonymous)'}  ${where}:${lineNumber + 1}`;
    fnTotals.set(key, (fnTotals.get(key) ?? 0) + us);
    const a = areas(url, functionName);
    areaTotals.set(a, (areaTotals.get(a) ?? 0) + us);
  }
  const pct = (us: number) => `${((us / total) * 100).toFixed(1).padStart(5)} %`;
  const lines = [`  ${(total / 1e6).toFixed(2)} s of busy samples; by area (self time):`];
  for (const [a, us] of [...areaTotals].sort((x, y) => y[1] - x[1]).slice(0, 12)) lines.push(`    ${pct(us)}  ${a}`);
  lines.push('  top functions (self time):');
  for (const [k, us] of [...fnTotals].sort((x, y) => y[1] - x[1]).slice(0, top)) lines.push(`    ${pct(us)}  ${k}`);
  if (ownTop > 0) {
    lines.push("  our own functions, inclusive time (with what they call; a caller's share includes its callees'):");
    for (const [k, us] of [...ownInclusive(prof, byId)].sort((x, y) => y[1] - x[1]).slice(0, ownTop)) lines.push(`    ${pct(us)}  ${k}`);
  }
  return lines;
}

const isOwn = (url: string) => url.startsWith('file://') && !url.includes('/node_modules/') && /\/(shared|server|cli|dist)\//.test(url);

/** Time spent inside each of the project's own functions, callees included, once per sample. */
function ownInclusive(prof: CpuProfile, byId: Map<number, ProfileNode>): Map<string, number> {
  const parent = new Map<number, number>();
  for (const n of prof.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const totals = new Map<string, number>();
  for (let i = 0; i < prof.samples.length; i++) {
    const seen = new Set<string>();
    for (let id: number | undefined = prof.samples[i]; id !== undefined; id = parent.get(id)) {
      const { functionName, url, lineNumber } = byId.get(id)!.callFrame;
      if (!isOwn(url) || !functionName) continue;
      seen.add(`${functionName}  ${relative(repoRoot, new URL(url).pathname)}:${lineNumber + 1}`);
    }
    for (const k of seen) totals.set(k, (totals.get(k) ?? 0) + (prof.timeDeltas[i] ?? 0));
  }
  return totals;
}
