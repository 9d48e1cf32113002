import cliProgress from 'cli-progress';

/**
 * A progress bar on stderr for long work; silent when stderr is not a terminal or for small jobs
 * (fewer than 20 units, or `show` false). `share`: the units are not items to count.
 */
export function progressBar(
  total: number,
  label: string,
  opts: { show?: boolean; share?: boolean } = {},
): { tick: (done: number) => void; stop: () => void } {
  if (!process.stderr.isTTY || total < 20 || opts.show === false) return { tick: () => {}, stop: () => {} };
  const count = opts.share ? '' : ' {value}/{total}';
  const bar = new cliProgress.SingleBar(
    {
      format: `${label} [{bar}]${count} {percentage}% | {eta_formatted} left`,
      stream: process.stderr,
      hideCursor: true,
      // Before the first step the estimate is 'NULL' or 'INF' (printed as "NFs"): say "?" instead.
      formatTime: (t: unknown, o: cliProgress.Options, r: number) => (typeof t === 'number' && Number.isFinite(t) ? cliProgress.Format.TimeFormat(t, o, r) : '?'),
    },
    cliProgress.Presets.legacy,
  );
  bar.start(total, 0);
  return { tick: (done) => bar.update(done), stop: () => bar.stop() };
}

/**
 * One line on stderr before a long step whose work cannot be counted from here (the analysis
 * gives no progress callback): at least the coder knows trellis is working. Silent under --json,
 * when stderr is not a terminal, and for studies smaller than `from` passages.
 */
export function workingNote(text: string, opts: { json?: boolean; passages: number; from?: number }): void {
  if (opts.json || !process.stderr.isTTY || opts.passages < (opts.from ?? 2000)) return;
  process.stderr.write(`${text}\n`);
}

/**
 * Runs `work` under one bar over a command made of steps, each given its share of the whole
 * (measured on a large study); `work` reports how far each step is (0 to 1). The bar is stopped
 * however `work` ends.
 */
export function withStepBar<S extends string, T>(label: string, shares: Record<S, readonly [number, number]>, show: boolean, work: (step: (step: S, done: number) => void) => T): T {
  const bar = progressBar(1000, label, { show, share: true });
  try {
    return work((step, done) => {
      const [from, to] = shares[step];
      bar.tick(Math.round(1000 * (from + (to - from) * done)));
    });
  } finally {
    bar.stop();
  }
}
