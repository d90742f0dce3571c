import { describe, expect, it } from 'vitest';
import { createEtaProgress, estimateRemainingMs, formatDuration } from '../../../../main/cli/fit-history/eta-progress';
import type { CliIo } from '../../../../main/cli/io';

function io(tty: boolean): CliIo & { err: string[] } {
  const err: string[] = [];
  return { err, stdout: () => {}, stderr: (t) => err.push(t), stderrIsTty: tty, cwd: '/', readInput: async () => '' };
}

describe('eta progress', () => {
  it('extrapolates the remaining time from the share done', () => {
    expect(estimateRemainingMs(10_000, 0.25)).toBe(30_000);
    expect(estimateRemainingMs(100, 0.01)).toBeNull();
    expect(estimateRemainingMs(5000, 1)).toBe(0);
    expect(formatDuration(65_000)).toBe('1:05');
    expect(formatDuration(3_725_000)).toBe('1:02:05');
  });

  it('draws a bar with the ETA in place on a terminal', () => {
    let t = 0;
    const out = io(true);
    const bar = createEtaProgress(out, () => t);
    t = 20_000;
    bar.update(0.5, 'arrival: refit on all flights');
    bar.done();
    expect(out.err[0]).toMatch(/^\r\[#{14}-{14}\]  50%  ETA 0:20  arrival: refit on all flights/);
    expect(out.err[1]).toBe('\n');
  });

  it('writes one plain line per stage when stderr is not a terminal', () => {
    let t = 0;
    const out = io(false);
    const bar = createEtaProgress(out, () => t);
    for (let rows = 1000; rows <= 5000; rows += 1000) {
      t += 100;
      bar.update(rows / 25_000, `reading history.csv: ${rows} rows`);
    }
    bar.update(0.3, 'arrival: fit without the held-out month');
    expect(out.err).toHaveLength(2);
    expect(out.err[1]).toMatch(/^ 30%  ETA 0:01  arrival: fit without the held-out month\n$/);
  });
});
