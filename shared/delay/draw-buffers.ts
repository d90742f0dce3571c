// Reused rows for the samplers' bulk draws (Rng.uniformExponentialPairs, Rng.exponentials):
// one simulation sweep asks for thousands of draws per distribution, and a row each time
// would be an off-heap store per call. Filled and read within one sampleInto call.

let uniforms = new Float64Array(256);
let exponentials = new Float64Array(256);

/** How many of out[start], out[start + stride], ... lie inside out. */
export function strideCount(length: number, start: number, stride: number): number {
  return start < length ? Math.ceil((length - start) / stride) : 0;
}

/** A row of at least `count` for uniforms. */
export function uniformRow(count: number): Float64Array {
  if (uniforms.length < count) uniforms = new Float64Array(Math.max(count, 2 * uniforms.length));
  return uniforms;
}

/** A row of at least `count` for exponentials. */
export function exponentialRow(count: number): Float64Array {
  if (exponentials.length < count) exponentials = new Float64Array(Math.max(count, 2 * exponentials.length));
  return exponentials;
}
