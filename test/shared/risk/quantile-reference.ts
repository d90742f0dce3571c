// The reference the risk tests check quantiles against: Hyndman & Fan (1996) definition 7
// (R's quantile type 7 and NumPy's default) on values already sorted ascending, straight from
// its formula. Checked against R's values in connection-probability.test.ts.

/** Quantile p of ascending values. */
export function sortedQuantile(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const i = Math.floor(h);
  const lo = sorted[i] ?? NaN;
  const hi = sorted[Math.min(n - 1, i + 1)] ?? NaN;
  return lo + (h - i) * (hi - lo);
}
