// A benchmark suite: named cases that print measured figures. `npm run bench` runs them all.
//
// Performance targets are checked here, never in timed unit tests. Figures depend on the
// machine; the closing note of each change records the ones measured.

export interface BenchRow {
  readonly name: string;
  /** Wall-clock milliseconds (median of the runs, where a case repeats). */
  readonly ms: number;
  /** The target in milliseconds, when the issue sets one. */
  readonly targetMs?: number;
  /** Anything else worth printing: iterations, recovery error, rows per second. */
  readonly notes?: string;
}

export interface BenchSuite {
  readonly name: string;
  readonly run: (log: (line: string) => void) => Promise<BenchRow[]>;
}

/** Median wall time of `runs` calls of fn, after one warm-up call. */
export async function timeMedian(fn: () => unknown | Promise<unknown>, runs = 5): Promise<number> {
  await fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  return times[Math.floor(times.length / 2)] ?? NaN;
}
