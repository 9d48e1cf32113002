import cliProgress from 'cli-progress';

/** A progress bar on stderr for long work; silent when stderr is not a terminal or for small jobs. */
export function progressBar(total: number, label: string, minTotal = 20): { tick: (done: number) => void; stop: () => void } {
  if (!process.stderr.isTTY || total < minTotal) return { tick: () => {}, stop: () => {} };
  const bar = new cliProgress.SingleBar(
    { format: `${label} [{bar}] {value}/{total} {percentage}% | {eta_formatted} left`, stream: process.stderr, hideCursor: true },
    cliProgress.Presets.legacy,
  );
  bar.start(total, 0);
  return { tick: (done) => bar.update(done), stop: () => bar.stop() };
}
