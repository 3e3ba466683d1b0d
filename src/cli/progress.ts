import type { SingleBar } from 'cli-progress';

/** Something long work reports to; a no-op when stderr is not a terminal or --quiet is set. */
export interface Progress {
  tick(by?: number): void;
  done(): void;
}

const silent: Progress = { tick() {}, done() {} };

/**
 * A progress bar on stderr (cli-progress), shown only when stderr is a terminal and the work
 * is big enough to be worth it (`total >= minTotal`).
 */
export async function progressBar(opts: { label: string; total: number; quiet?: boolean; minTotal?: number }): Promise<Progress> {
  const { label, total, quiet = false, minTotal = 1 } = opts;
  if (quiet || !process.stderr.isTTY || total < minTotal) return silent;
  const { default: cliProgress } = await import('cli-progress');
  // A stream of its own on the terminal: the bar's escape sequences must not go through the
  // guard that escapes control characters on process.stderr (terminalSafe).
  const { WriteStream } = await import('node:tty');
  const stream = new WriteStream(2);
  const bar: SingleBar = new cliProgress.SingleBar(
    { format: `${label} [{bar}] {value}/{total} {eta_formatted}`, stream, hideCursor: true, clearOnComplete: true },
    cliProgress.Presets.shades_classic,
  );
  bar.start(total, 0);
  return {
    tick: (by = 1) => bar.increment(by),
    done: () => bar.stop(),
  };
}
