// Cold start: `node bin/weir.js --version` against `node -e 0`, the least a Node program costs.
// Budget: ≤ 1.6×.
import { atMost, skipped, type Figure } from './lib/report.ts';
import { run, weirBin } from './lib/processes.ts';
import { fmt, timePair } from './lib/stats.ts';

const BENCH = 'cold start';
const LIMIT = 1.6;

export async function benchColdStart({ runs }: { runs: number }): Promise<Figure[]> {
  const bin = weirBin();
  const figure = 'node bin/weir.js --version vs node -e 0';
  if (!bin) return [skipped(BENCH, figure, 'the CLI is not built', `≤ ${LIMIT}×`)];
  const probe = await run(process.execPath, [bin, '--version']);
  if (probe.code !== 0) return [{ bench: BENCH, figure, value: '—', budget: `≤ ${LIMIT}×`, result: 'OVER', note: `weir --version exited ${probe.code}: ${probe.stderrHead.slice(0, 300)}` }];
  const { subject, baseline } = await timePair(
    () => run(process.execPath, [bin, '--version']),
    () => run(process.execPath, ['-e', '0']),
    { runs, warmup: 2 },
  );
  const ratio = subject.median / baseline.median;
  return [{
    bench: BENCH,
    figure,
    value: fmt.ms(subject.median),
    baseline: fmt.ms(baseline.median),
    ratio: fmt.ratio(ratio),
    budget: `≤ ${LIMIT}×`,
    result: atMost(ratio, LIMIT),
    note: `medians of ${runs} runs; prints ${JSON.stringify(probe.stdoutHead.trim())}`,
  }];
}
