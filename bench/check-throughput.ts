// Check throughput: `weir check --format json DIR` (YAML, schema and every rule) against ajv-cli
// validating the same files against the same schema (schema only), timed alternately in the
// same run. Budget: weir ≤ 1.0× ajv-cli at 1,000 files, and linear growth (10× the files in
// ≤ 11× the time).
import { rmSync } from 'node:fs';
import { join } from 'node:path';
import { writeSites, type BaseSite } from './generate-sites.ts';
import { atMost, skipped, type Figure } from './lib/report.ts';
import { outDir, repoRoot, run, weirBin } from './lib/processes.ts';
import { fmt, timePair } from './lib/stats.ts';

const BENCH = 'check';
const AJV_CLI = join(repoRoot, 'node_modules/ajv-cli/dist/index.js');
const SCHEMA = join(repoRoot, 'schemas/site.schema.json');

export interface CheckOptions {
  sizes: [small: number, large: number];
  runs: [small: number, large: number];
  seed: number;
  bases: BaseSite[];
}

/**
 * `weir check` can reuse earlier results (`--cache`, cli/lib/check-cache.ts). The budget is for
 * the work itself, so the timed runs go without it (and with WEIR_NO_CACHE=1 should the default
 * change); one extra row shows unchanged files with it. Its folder is under bench/.out, never the
 * user's own cache.
 */
/** The range of the runs, so that a noisy machine shows in the report. */
const spread = (samples: number[]) => `${Math.min(...samples).toFixed(0)}–${Math.max(...samples).toFixed(0)} ms`;

const weirArgs = (bin: string, dir: string, cache = false) => [bin, 'check', '--format', 'json', ...(cache ? ['--cache'] : []), dir];
const weirEnv = (cache = false): NodeJS.ProcessEnv => {
  const env: NodeJS.ProcessEnv = { ...process.env, XDG_CACHE_HOME: join(outDir, 'cli-cache') };
  if (cache) delete env.WEIR_NO_CACHE;
  else env.WEIR_NO_CACHE = '1';
  return env;
};
const ajvArgs = (dir: string) => [AJV_CLI, 'validate', '--spec=draft2020', '-s', SCHEMA, '-d', `${dir}/*.yaml`];

/** One untimed run of each, to make sure both did the whole job on these files. */
async function sanityCheck(bin: string, dir: string, count: number): Promise<string | null> {
  const weir = await run(process.execPath, weirArgs(bin, dir), { headBytes: 512 * 1024 * 1024, env: weirEnv() });
  if (weir.code !== 0 && weir.code !== 1) return `weir check exited ${weir.code}: ${(weir.stderrHead || weir.stdoutHead).slice(0, 400)}`;
  let report: { files?: unknown[] };
  try {
    report = JSON.parse(weir.stdoutHead);
  } catch {
    return `weir check --format json printed no JSON: ${weir.stdoutHead.slice(0, 200)}`;
  }
  if (Array.isArray(report.files) && report.files.length !== count) return `weir check reported ${report.files.length} files of ${count}`;
  const ajv = await run(process.execPath, ajvArgs(dir), { headBytes: 64 * 1024 * 1024 });
  const valid = (ajv.stdoutHead + ajv.stderrHead).match(/ valid$/gm)?.length ?? 0;
  if (ajv.code !== 0) return `ajv-cli exited ${ajv.code} (a generated file failed the schema?): ${ajv.stderrHead.slice(0, 400)}`;
  if (valid !== count) return `ajv-cli reported ${valid} valid files of ${count}`;
  return null;
}

export async function benchCheckThroughput(opts: CheckOptions): Promise<Figure[]> {
  const [small, large] = opts.sizes;
  const bin = weirBin();
  const budgetRatio = '≤ 1.00×';
  const growthLimit = 1.1 * (large / small);
  const growthBudget = `≤ ${growthLimit.toFixed(1)}×`;
  if (!bin) {
    return [
      skipped(BENCH, `weir vs ajv-cli, ${small.toLocaleString('en-GB')} files`, 'the CLI is not built (bin/weir.js + npm run build:cli)', budgetRatio),
      skipped(BENCH, `growth ${small.toLocaleString('en-GB')} → ${large.toLocaleString('en-GB')} files`, 'the CLI is not built', growthBudget),
    ];
  }

  const figures: Figure[] = [];
  const weirMedians: number[] = [];
  for (const [i, count] of opts.sizes.entries()) {
    const dir = join(outDir, `sites-${count}`);
    writeSites(dir, count, opts.seed, opts.bases);
    const problem = await sanityCheck(bin, dir, count);
    const label = `weir check vs ajv-cli, ${count.toLocaleString('en-GB')} files`;
    if (problem) {
      figures.push({ bench: BENCH, figure: label, value: '—', budget: i === 0 ? budgetRatio : undefined, result: i === 0 ? 'OVER' : 'INFO', note: problem });
      weirMedians.push(NaN);
      continue;
    }
    // Both warmed up by sanityCheck; one more untimed round each inside timePair.
    const { subject, baseline } = await timePair(
      () => run(process.execPath, weirArgs(bin, dir), { env: weirEnv() }),
      () => run(process.execPath, ajvArgs(dir)),
      { runs: opts.runs[i], warmup: 1 },
    );
    weirMedians.push(subject.median);
    const ratio = subject.median / baseline.median;
    figures.push({
      bench: BENCH,
      figure: label,
      value: fmt.ms(subject.median),
      baseline: fmt.ms(baseline.median),
      ratio: fmt.ratio(ratio),
      budget: i === 0 ? budgetRatio : undefined,
      result: i === 0 ? atMost(ratio, 1.0) : 'INFO',
      note: `${i === 0 ? `medians of ${opts.runs[i]} runs, without --cache; ` : ''}weir ${fmt.int((count / subject.median) * 1000)} files/s (runs ${spread(subject.samples)}), ajv-cli ${fmt.int((count / baseline.median) * 1000)} files/s (runs ${spread(baseline.samples)})`,
    });
    if (i === 0) {
      // The same files again with the cache on: what CI sees on a commit that changed nothing.
      rmSync(join(outDir, 'cli-cache'), { recursive: true, force: true });
      const warm = await timePair(
        () => run(process.execPath, weirArgs(bin, dir, true), { env: weirEnv(true) }),
        () => run(process.execPath, ajvArgs(dir)),
        { runs: opts.runs[i], warmup: 1 },
      );
      figures.push({ bench: BENCH, figure: '  same, unchanged files, with --cache', value: fmt.ms(warm.subject.median), baseline: fmt.ms(warm.baseline.median), ratio: fmt.ratio(warm.subject.median / warm.baseline.median), result: 'INFO', note: 'not the budget: the cache skips the schema and the rules for files already checked' });
    }
  }
  const growth = weirMedians[1] / weirMedians[0];
  figures.push({
    bench: BENCH,
    figure: `weir growth, ${small.toLocaleString('en-GB')} → ${large.toLocaleString('en-GB')} files`,
    value: Number.isFinite(growth) ? fmt.ratio(growth) : '—',
    budget: growthBudget,
    result: atMost(growth, growthLimit),
    note: `${large / small}× the files; linear growth gives ${(large / small).toFixed(1)}×`,
  });
  return figures;
}
