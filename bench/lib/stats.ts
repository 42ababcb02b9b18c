// Timing helpers. This machine's absolute speed drifts, so every figure is a median of several
// runs after a warm-up, and every budget compares against a baseline timed in the same run.

export function median(values: readonly number[]): number {
  if (values.length === 0) return NaN;
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

export interface Samples {
  samples: number[];
  median: number;
}

/**
 * Times `subject` and `baseline` alternately (after `warmup` untimed rounds of each), so that
 * drift in the machine's speed during the run hits both alike. Returns milliseconds.
 */
export async function timePair(
  subject: () => Promise<unknown> | unknown,
  baseline: () => Promise<unknown> | unknown,
  { runs, warmup = 1 }: { runs: number; warmup?: number },
): Promise<{ subject: Samples; baseline: Samples }> {
  for (let i = 0; i < warmup; i++) {
    await subject();
    await baseline();
  }
  const a: number[] = [];
  const b: number[] = [];
  for (let i = 0; i < runs; i++) {
    // Alternate which goes first, so neither always runs on a warmer cache.
    const order = i % 2 === 0 ? [subject, baseline] : [baseline, subject];
    for (const fn of order) {
      const t0 = performance.now();
      await fn();
      (fn === subject ? a : b).push(performance.now() - t0);
    }
  }
  return { subject: { samples: a, median: median(a) }, baseline: { samples: b, median: median(b) } };
}

export const fmt = {
  ms: (v: number) => (v >= 100 ? `${v.toFixed(0)} ms` : v >= 10 ? `${v.toFixed(1)} ms` : `${v.toFixed(2)} ms`),
  s: (ms: number) => `${(ms / 1000).toFixed(2)} s`,
  ratio: (v: number) => `${v.toFixed(2)}×`,
  int: (v: number) => Math.round(v).toLocaleString('en-GB'),
  kb: (bytes: number) => `${(bytes / 1024).toFixed(1)} KB`,
};
