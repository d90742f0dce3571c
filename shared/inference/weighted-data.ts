// Collapsing raw (group, value) rows into weighted (group, value, count) triples.
//
// Delays are integer minutes, so millions of rows repeat a few thousand (group, value) pairs;
// the weighted likelihood over the triples equals the full-data likelihood exactly.
import type { WeightedData } from './model';

/**
 * Collapse rows into triples, ordered by group then value. Rows with a NaN value are an error
 * (the caller decides how to clean data, not this function); so is a group outside [0, groupCount).
 * @example collapseWeighted(Int32Array.of(0, 0, 1), Float64Array.of(5, 5, 7), 2) // 2 triples: (0, 5, 2), (1, 7, 1)
 */
export function collapseWeighted(group: ArrayLike<number>, value: ArrayLike<number>, groupCount: number): WeightedData {
  const n = group.length;
  if (value.length !== n) throw new RangeError(`group has ${n} rows but value has ${value.length}`);
  if (!(groupCount >= 1) || !Number.isInteger(groupCount)) throw new RangeError(`groupCount must be a whole number >= 1, got ${groupCount}`);
  for (let i = 0; i < n; i++) {
    const g = group[i]!;
    if (!(g >= 0 && g < groupCount) || !Number.isInteger(g)) throw new RangeError(`row ${i} has group ${g}, outside [0, ${groupCount})`);
    if (!Number.isFinite(value[i]!)) throw new RangeError(`row ${i} has a non-finite value ${value[i]}`);
  }
  // Typed-array sort of packed keys is much faster than a comparator sort when the values
  // are small integers, the usual case for minutes; otherwise fall back to a comparator.
  let integral = true;
  let minV = Infinity;
  let maxV = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = value[i]!;
    if (!Number.isInteger(v)) { integral = false; break; }
    if (v < minV) minV = v;
    if (v > maxV) maxV = v;
  }
  if (integral && n > 0 && (maxV - minV + 1) * groupCount < 2 ** 52) {
    const span = maxV - minV + 1;
    const keys = new Float64Array(n);
    for (let i = 0; i < n; i++) keys[i] = group[i]! * span + (value[i]! - minV);
    keys.sort();
    // Rebuild triples straight from sorted keys.
    let triples = 0;
    for (let i = 0; i < n; i++) if (i === 0 || keys[i] !== keys[i - 1]) triples++;
    const tg = new Int32Array(triples);
    const tv = new Float64Array(triples);
    const tc = new Float64Array(triples);
    let t = -1;
    for (let i = 0; i < n; i++) {
      const k = keys[i]!;
      if (i === 0 || k !== keys[i - 1]) {
        t++;
        const g = Math.floor(k / span);
        tg[t] = g;
        tv[t] = k - g * span + minV;
      }
      tc[t]! += 1;
    }
    return { groupCount, group: tg, value: tv, count: tc };
  }
  const sorted = Array.from({ length: n }, (_, i) => i);
  sorted.sort((a, b) => group[a]! - group[b]! || value[a]! - value[b]!);
  const tg: number[] = [];
  const tv: number[] = [];
  const tc: number[] = [];
  for (let j = 0; j < n; j++) {
    const i = sorted[j]!;
    const last = tg.length - 1;
    if (last >= 0 && tg[last] === group[i] && tv[last] === value[i]) tc[last]! += 1;
    else { tg.push(group[i]!); tv.push(value[i]!); tc.push(1); }
  }
  return { groupCount, group: Int32Array.from(tg), value: Float64Array.from(tv), count: Float64Array.from(tc) };
}
