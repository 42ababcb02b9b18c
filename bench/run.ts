// `npm run bench [-- --quick] [--no-build] [--only check,engine,...]`: builds what the benches
// time (the CLI, the server, the reviewer), runs every benchmark, then prints one table of every
// figure with its budget and PASS/OVER. Timing never fails the run: it exits 0 either way (2 only
// for a bad option). The table also goes to bench/.out/results.{md,json}.
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { cpus, loadavg } from 'node:os';
import { benchApi } from './api.ts';
import { benchCheckThroughput } from './check-throughput.ts';
import { benchColdStart } from './cold-start.ts';
import { benchEngine } from './engine.ts';
import { loadBases } from './generate-sites.ts';
import { outDir, run } from './lib/processes.ts';
import { renderMarkdown, renderTable, type Figure } from './lib/report.ts';
import { benchReviewer } from './reviewer.ts';

const BENCHES = ['check', 'cold-start', 'engine', 'api', 'reviewer'] as const;
type BenchName = (typeof BENCHES)[number];

const USAGE = `usage: npm run bench [-- [--quick] [--no-build] [--only ${BENCHES.join(',')}]]
  --quick     smaller sizes, fewer runs (1–3 minutes instead of 3–8; the first run also seeds a fleet)
  --no-build  time what is in dist/ as it is
  --only      run only the named benches`;

function parseArgs(argv: string[]) {
  if (argv.includes('--help') || argv.includes('-h')) return { help: true as const };
  const quick = argv.includes('--quick');
  const build = !argv.includes('--no-build');
  let only: BenchName[] = [...BENCHES];
  const i = argv.indexOf('--only');
  if (i >= 0) {
    const wanted = (argv[i + 1] ?? '').split(',').filter(Boolean);
    const unknown = wanted.filter((w) => !(BENCHES as readonly string[]).includes(w));
    if (unknown.length || wanted.length === 0) return { error: `--only takes a comma-separated list of: ${BENCHES.join(', ')}` };
    only = wanted as BenchName[];
  }
  const known = new Set(['--quick', '--no-build', '--only', ...(i >= 0 ? [argv[i + 1]] : [])]);
  const stray = argv.filter((a) => !known.has(a));
  if (stray.length) return { error: `unknown option ${stray[0]}; use --quick, --no-build and/or --only ${BENCHES.join(',')}` };
  return { quick, build, only };
}

const SEED = 20_261_120;

/** What each bench times, and the npm script that builds it. */
const BUILDS: [script: string, needed: BenchName[]][] = [
  ['build:cli', ['check', 'cold-start']],
  ['build:server', ['api', 'reviewer']],
  ['build:web', ['reviewer']],
];

/** Builds what the chosen benches time, so they never time a stale dist/. A failed build is reported, not fatal. */
async function buildAll(only: BenchName[]): Promise<string[]> {
  const notes: string[] = [];
  for (const [script, needed] of BUILDS) {
    if (!needed.some((b) => only.includes(b))) continue;
    const t0 = Date.now();
    const res = await run('npm', ['run', '-s', script]);
    notes.push(res.code === 0 ? `built: npm run ${script} (${((Date.now() - t0) / 1000).toFixed(0)} s)` : `npm run ${script} failed (exit ${res.code}); timing what is in dist/: ${(res.stderrHead || res.stdoutHead).trim().split('\n').slice(-3).join(' | ')}`);
  }
  return notes;
}

async function main() {
  const args = parseArgs(process.argv.slice(2));
  if ('help' in args) {
    console.log(USAGE);
    return;
  }
  if ('error' in args) {
    console.error(`${args.error}\n${USAGE}`);
    process.exitCode = 2;
    return;
  }
  const { quick, build, only } = args;
  mkdirSync(outDir, { recursive: true });
  const buildNotes = build ? await buildAll(only) : ['not rebuilt (--no-build): timing what is in dist/'];
  const bases = loadBases();
  const started = Date.now();
  console.log(`weir benchmarks${quick ? ' (quick)' : ''}: node ${process.version}, ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}; ${bases.length} base site files (${bases.map((b) => b.name).join(', ')})`);

  const figures: Figure[] = [];
  const extra: string[] = [...buildNotes];
  for (const n of buildNotes) console.log(n);
  const step = async (name: BenchName, fn: () => Promise<Figure[]>) => {
    if (!only.includes(name)) return;
    const t0 = Date.now();
    process.stdout.write(`\n== ${name} … `);
    const loadBefore = loadavg()[0];
    try {
      const got = await fn();
      figures.push(...got);
      // Other work on the machine makes the figures noisy: say how busy it was.
      extra.push(`${name}: ${((Date.now() - t0) / 1000).toFixed(0)} s, load average ${loadBefore.toFixed(1)} before, ${loadavg()[0].toFixed(1)} after (${cpus().length} cores)`);
      console.log(`done in ${((Date.now() - t0) / 1000).toFixed(0)} s`);
      console.log(renderTable(got));
    } catch (err) {
      // A bench that breaks is reported like an over-budget figure, and the others still run.
      const message = (err as Error)?.stack ?? String(err);
      console.log(`failed: ${message}`);
      figures.push({ bench: name, figure: '(bench failed)', value: '—', result: 'OVER', note: message.split('\n')[0] });
    }
  };

  await step('check', () => benchCheckThroughput({ sizes: quick ? [1000, 3000] : [1000, 10_000], runs: quick ? [3, 1] : [5, 3], seed: SEED, bases }));
  await step('cold-start', () => benchColdStart({ runs: quick ? 7 : 15 }));
  await step('engine', async () => {
    const { figures: got, profile } = await benchEngine({ count: quick ? 300 : 1000, runs: quick ? 5 : 9, seed: SEED, bases });
    extra.push(...profile);
    console.log(profile.join('\n'));
    return got;
  });
  await step('api', async () => {
    const { figures: got, notes } = await benchApi({ quick, seed: SEED, bases });
    extra.push(...notes);
    console.log(notes.join('\n'));
    return got;
  });
  await step('reviewer', async () => {
    const { figures: got, notes } = await benchReviewer({ quick, seed: SEED, bases });
    extra.push(...notes);
    if (notes.length) console.log(notes.join('\n'));
    return got;
  });

  const over = figures.filter((f) => f.result === 'OVER').length;
  const minutes = ((Date.now() - started) / 60_000).toFixed(1);
  console.log(`\n== all figures (${minutes} min${quick ? ', quick' : ''}; ${over} OVER)`);
  console.log(renderTable(figures));
  const md = [`Measured ${new Date().toISOString().slice(0, 10)} with \`npm run bench${quick ? ' -- --quick' : ''}\`, node ${process.version}, ${cpus().length} cores.`, '', renderMarkdown(figures), '', ...figures.filter((f) => f.note).map((f) => `- ${f.bench} / ${f.figure.trim()}: ${f.note}`), '', '```', ...extra, '```', ''].join('\n');
  writeFileSync(join(outDir, 'results.md'), md);
  writeFileSync(join(outDir, 'results.json'), JSON.stringify({ date: new Date().toISOString(), quick, node: process.version, figures, extra }, null, 2));
  console.log(`\nwritten: bench/.out/results.md and results.json`);
  process.exitCode = 0;
}

await main();
