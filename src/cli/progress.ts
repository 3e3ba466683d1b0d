import type { SingleBar } from 'cli-progress';

/** Something long work reports to; a no-op when stderr is not a terminal or --quiet is set. */
export interface Progress {
  tick(by?: number): void;
  /** Names the stage the work is in ("analysing sample-wise maps", "writing the PDF deck"). */
  stage(text: string): void;
  done(): void;
}

const silent: Progress = { tick() {}, stage() {}, done() {} };

/**
 * A smoothed time-to-go. Work done in bursts (parallel workers finishing together, runs of very
 * different cost) makes the rate over the last few updates swing (9m30s, then 6 s): the estimate
 * here uses the average rate since the start, and the shown value moves toward each new estimate
 * by a fraction `alpha` per update (an exponential moving average, common practice) while
 * counting down with the clock between updates.
 */
export class EtaSmoother {
  private shown: number | null = null;
  private lastAt = 0;
  constructor(private readonly total: number, private readonly alpha = 0.15, private readonly startedAt = 0) {}

  /** Seconds to go after `done` of `total` units at time `now` (seconds); null before any unit. */
  update(done: number, now: number): number | null {
    const elapsed = now - this.startedAt;
    if (done <= 0 || elapsed <= 0) return null;
    const estimate = (elapsed * Math.max(0, this.total - done)) / done;
    if (this.shown === null) this.shown = estimate;
    else {
      const ticking = Math.max(0, this.shown - (now - this.lastAt));
      this.shown = ticking + this.alpha * (estimate - ticking);
    }
    this.lastAt = now;
    if (done >= this.total) this.shown = 0;
    return this.shown;
  }
}

/** "1h05m", "9m30s", "42s". */
export function formatEta(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return '…';
  const s = Math.round(seconds);
  if (s >= 3600) return `${Math.floor(s / 3600)}h${String(Math.floor((s % 3600) / 60)).padStart(2, '0')}m`;
  if (s >= 60) return `${Math.floor(s / 60)}m${String(s % 60).padStart(2, '0')}s`;
  return `${s}s`;
}

/**
 * A progress bar on stderr (cli-progress), shown only when stderr is a terminal and the work
 * is big enough to be worth it (`total >= minTotal`). It names the command and its stage, and
 * shows a smoothed time to go.
 */
export async function progressBar(opts: { label: string; total: number; quiet?: boolean; minTotal?: number; stage?: string }): Promise<Progress> {
  const { label, total, quiet = false, minTotal = 1 } = opts;
  if (quiet || !process.stderr.isTTY || total < minTotal) return silent;
  const { default: cliProgress } = await import('cli-progress');
  // A stream of its own on the terminal: the bar's escape sequences must not go through the
  // guard that escapes control characters on process.stderr (terminalSafe).
  const { WriteStream } = await import('node:tty');
  const stream = new WriteStream(2);
  const bar: SingleBar = new cliProgress.SingleBar(
    { format: `${label}: {stage} [{bar}] {value}/{total} {remaining}`, stream, hideCursor: true, clearOnComplete: true },
    cliProgress.Presets.shades_classic,
  );
  const clock = () => performance.now() / 1000;
  const eta = new EtaSmoother(total, 0.15, clock());
  let done = 0;
  let stage = opts.stage ?? 'working';
  bar.start(total, 0, { stage, remaining: '' });
  return {
    tick: (by = 1) => {
      done += by;
      bar.increment(by, { stage, remaining: `eta ${formatEta(eta.update(done, clock()))}` });
    },
    stage: (text: string) => {
      stage = text;
      bar.update({ stage });
    },
    done: () => bar.stop(),
  };
}
