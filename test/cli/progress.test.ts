import { describe, expect, it } from 'vitest';
import { EtaSmoother, formatEta } from '../../src/cli/progress.js';

describe('time to go', () => {
  it('work in bursts: the smoothed estimate swings far less than the rate of the last updates', () => {
    // 600 runs on 2 workers finishing in bursts of 20 after pauses (our own pattern): 20 runs per 19 s.
    const total = 600;
    const eta = new EtaSmoother(total, 0.15, 0);
    const shown: number[] = [];
    const naive: number[] = [];
    let t = 0;
    let done = 0;
    let last = { t: 0, done: 0 };
    while (done < total) {
      t += 19;
      for (let k = 0; k < 20; k++) {
        t += 0.05;
        done += 1;
        shown.push(eta.update(done, t)!);
        // What a rate over the last update gives (cli-progress' short buffer behaves like it).
        const rate = (done - last.done) / (t - last.t);
        naive.push((total - done) / rate);
        last = { t, done };
      }
    }
    const truth = (i: number) => (total - (i + 1)) * (19 + 20 * 0.05) / 20; // seconds left at the same rate
    const worst = (xs: number[]) => Math.max(...xs.slice(40, -40).map((x, i) => Math.abs(x - truth(i + 40)) / truth(i + 40)));
    expect(worst(shown)).toBeLessThan(0.35);
    expect(worst(naive)).toBeGreaterThan(0.9);
    // Over one burst and its pause, the shown value moves far less than the naive one.
    const jumps = (xs: number[]) => Math.max(...xs.slice(20).map((x, i) => Math.abs(x - xs[i + 19])));
    expect(jumps(naive)).toBeGreaterThan(5 * jumps(shown));
    expect(shown.at(-1)).toBe(0);
  });

  it('counts down between updates and reads as h/m/s', () => {
    const eta = new EtaSmoother(10, 0.15, 0);
    expect(eta.update(0, 1)).toBeNull();
    expect(eta.update(5, 10)).toBeCloseTo(10, 9);
    expect(formatEta(570)).toBe('9m30s');
    expect(formatEta(6)).toBe('6s');
    expect(formatEta(3900)).toBe('1h05m');
    expect(formatEta(null)).toBe('…');
  });
});
