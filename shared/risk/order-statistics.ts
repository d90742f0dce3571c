// Order statistics without a full sort, for the quantiles the risk engine reports.

/**
 * Hoare's quickselect with a middle pivot on a[from..end): reorders that range and returns the
 * value that sorting it would put at index k (from <= k < end). NaN-free input assumed.
 * @example selectInRange(Float64Array.of(9, 3, 7, 1), 0, 1, 4) // returns 3
 */
export function selectInRange(a: Float64Array, from: number, k: number, end: number): number {
  let left = from;
  let right = end - 1;
  while (left < right) {
    const pivot = a[(left + right) >>> 1]!;
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i]! < pivot) i++;
      while (a[j]! > pivot) j--;
      if (i <= j) {
        const tmp = a[i]!;
        a[i] = a[j]!;
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k]!;
}

/**
 * The p-quantile (Hyndman & Fan definition 7, R's type 7) of a[0..n), reordering it: the
 * order statistic at floor((n - 1) p) by selection, and the next one as the smallest value
 * above it. NaN for n = 0; NaN-free input assumed.
 */
export function selectQuantile(a: Float64Array, n: number, p: number): number {
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const i = Math.floor(h);
  const lo = selectInRange(a, 0, i, n);
  if (i + 1 >= n || h === i) return lo;
  // After the selection everything past i is at least a[i]: the next order statistic is their minimum.
  let hi = Infinity;
  for (let j = i + 1; j < n; j++) if (a[j]! < hi) hi = a[j]!;
  return lo + (h - i) * (hi - lo);
}
