// A progress bar on stderr for long runs, only when stderr is a terminal (never in logs or CI).
import cliProgress from 'cli-progress';

export interface Progress {
  tick(label: string): void;
  stop(): void;
}

const none: Progress = { tick() {}, stop() {} };

export function startProgress(total: number, what: string, enabled: boolean): Progress {
  if (!enabled || !process.stderr.isTTY || total < 2) return none;
  const bar = new cliProgress.SingleBar({
    format: `${what} [{bar}] {value}/{total} {label}`,
    stream: process.stderr,
    hideCursor: true,
    clearOnComplete: true,
    barsize: 24,
  }, cliProgress.Presets.shades_classic);
  bar.start(total, 0, { label: '' });
  return {
    tick: (label) => bar.increment(1, { label }),
    stop: () => bar.stop(),
  };
}
