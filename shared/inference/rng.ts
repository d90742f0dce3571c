// Seeded pseudo-random numbers for every fit and simulation.
//
// xoshiro128** (Blackman & Vigna, "Scrambled linear pseudorandom number generators",
// 2021) seeded through splitmix32, so any integer seed gives a well-mixed state. Exponential
// draws by the ziggurat method (Marsaglia & Tsang, "The Ziggurat Method for Generating Random
// Variables", Journal of Statistical Software 5(8), 2000), 256 layers.
// Nothing in Layline calls Math.random(): pass an Rng in.

export interface Rng {
  /** Uniform on the open interval (0, 1): never exactly 0 or 1, so logs are safe. */
  uniform(): number;
  /** Standard normal draw. */
  normal(): number;
  /**
   * Standard exponential draw (rate 1), strictly positive: what -log(uniform()) gives in
   * distribution, at about a third of its cost (no log for 99% of draws).
   */
  exponential(): number;
  /**
   * us[k] = uniform() then es[k] = exponential(), for k < count in turn: the same stream and
   * values as those calls, in one loop that keeps the state in registers (a draw returned from
   * a call that V8 does not inline is boxed on the heap, one allocation per draw).
   */
  uniformExponentialPairs(us: Float64Array, es: Float64Array, count: number): void;
  /** out[k] = exponential() for k < count: the same stream and values as the calls. */
  exponentials(out: Float64Array, count: number): void;
  /** Uniform integer in [0, n). */
  int(n: number): number;
  /** A new generator whose stream is independent of this one's for practical purposes. */
  split(): Rng;
}

function splitmix32(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x9e3779b9) >>> 0;
    let z = s;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
}

class Xoshiro128 implements Rng {
  // State in an Int32Array: plain number fields holding 32-bit values outside the small-integer
  // range make V8 box a heap number on every step, which dominated simulation loops.
  private readonly s = new Int32Array(4);
  private spareNormal = NaN;

  constructor(seed: number) {
    const next = splitmix32(seed);
    const s = this.s;
    s[0] = next();
    s[1] = next();
    s[2] = next();
    s[3] = next();
    if ((s[0] | s[1] | s[2] | s[3]) === 0) s[3] = 1;
  }

  private nextUint32(): number {
    return this.nextBits() >>> 0;
  }

  // The next 32 bits as a signed integer: a small integer to V8, where a uint32 of 2^31 or more
  // returned from a call that is not inlined is boxed on the heap (two per uniform).
  private nextBits(): number {
    const s = this.s;
    const s0 = s[0]!;
    const s1 = s[1]!;
    const s2 = s[2]!;
    const s3 = s[3]!;
    const result = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
    const t = s1 << 9;
    const c = s2 ^ s0;
    const d = s3 ^ s1;
    s[1] = s1 ^ c;
    s[0] = s0 ^ d;
    s[2] = c ^ t;
    s[3] = rotl(d, 11);
    return result;
  }

  uniform(): number {
    // 53 random bits mapped into (0, 1), with the +0.5 keeping both ends open.
    const hi = this.nextBits() >>> 5;
    const lo = this.nextBits() >>> 6;
    return (hi * 67108864 + lo + 0.5) / 9007199254740992;
  }

  exponential(): number {
    // Layer i from the low 8 bits; the whole word places the point in the layer, accepted at
    // once when it lies inside the layer's rectangle. The +0.5 keeps the draw above 0.
    const j = this.nextBits() >>> 0;
    if (j < ZIGGURAT_K[j & 255]!) return (j + 0.5) * ZIGGURAT_W[j & 255]!;
    return this.exponentialAfter(j);
  }

  // exponential() once its first word j fell outside its layer's rectangle.
  private exponentialAfter(first: number): number {
    for (let j = first; ; j = this.nextBits() >>> 0) {
      const i = j & 255;
      if (j < ZIGGURAT_K[i]!) return (j + 0.5) * ZIGGURAT_W[i]!;
      // The base layer's tail beyond R is R plus an exponential (memorylessness).
      if (i === 0) return ZIGGURAT_R - Math.log(this.uniform());
      // The wedge above the rectangle: accept under the density.
      const x = (j + 0.5) * ZIGGURAT_W[i]!;
      if (ZIGGURAT_F[i]! + this.uniform() * (ZIGGURAT_F[i - 1]! - ZIGGURAT_F[i]!) < Math.exp(-x)) return x;
    }
  }

  uniformExponentialPairs(us: Float64Array, es: Float64Array, count: number): void {
    this.fill(us, es, count, true);
  }

  exponentials(out: Float64Array, count: number): void {
    this.fill(out, out, count, false);
  }

  // The bulk draws: nextBits and the ziggurat's fast path written out over a local copy of the
  // state, which goes back to this.s before any slow path calls uniform() and after the loop.
  private fill(us: Float64Array, es: Float64Array, count: number, withUniform: boolean): void {
    const state = this.s;
    let s0 = state[0]!;
    let s1 = state[1]!;
    let s2 = state[2]!;
    let s3 = state[3]!;
    for (let k = 0; k < count; k++) {
      // Three words with a uniform (its high and low bits, then the exponential's), else one.
      let word = 0;
      let high = 0;
      for (let w = withUniform ? 0 : 2; w < 3; w++) {
        word = Math.imul(rotl(Math.imul(s1, 5), 7), 9);
        const t = s1 << 9;
        const c = s2 ^ s0;
        const d = s3 ^ s1;
        s1 ^= c;
        s0 ^= d;
        s2 = c ^ t;
        s3 = rotl(d, 11) | 0;
        if (w === 0) high = word >>> 5;
        else if (w === 1) us[k] = (high * 67108864 + (word >>> 6) + 0.5) / 9007199254740992;
      }
      const j = word >>> 0;
      const i = j & 255;
      if (j < ZIGGURAT_K[i]!) {
        es[k] = (j + 0.5) * ZIGGURAT_W[i]!;
        continue;
      }
      // Rare (about 1 draw in 100): the rest of exponential() after its first word, on the
      // stored state.
      state[0] = s0;
      state[1] = s1;
      state[2] = s2;
      state[3] = s3;
      es[k] = this.exponentialAfter(j);
      s0 = state[0]!;
      s1 = state[1]!;
      s2 = state[2]!;
      s3 = state[3]!;
    }
    state[0] = s0;
    state[1] = s1;
    state[2] = s2;
    state[3] = s3;
  }

  normal(): number {
    // Marsaglia's polar method; caches the second draw of each pair.
    if (!Number.isNaN(this.spareNormal)) {
      const z = this.spareNormal;
      this.spareNormal = NaN;
      return z;
    }
    let u: number;
    let v: number;
    let s: number;
    do {
      u = 2 * this.uniform() - 1;
      v = 2 * this.uniform() - 1;
      s = u * u + v * v;
    } while (s >= 1 || s === 0);
    const f = Math.sqrt((-2 * Math.log(s)) / s);
    this.spareNormal = v * f;
    return u * f;
  }

  int(n: number): number {
    if (!(n >= 1) || !Number.isInteger(n)) throw new RangeError(`Rng.int needs a whole number n >= 1, got ${n}`);
    return Math.floor(this.uniform() * n);
  }

  split(): Rng {
    return new Xoshiro128(this.nextUint32() ^ 0x5bd1e995);
  }
}

// The exponential ziggurat's tables (Marsaglia & Tsang's zigset for the exponential): the
// right edge of the base layer R and the common layer area V for 256 layers; per layer, the
// acceptance threshold on a 32-bit word (K), the word-to-x scale (W) and the density at the
// layer's right edge (F).
const ZIGGURAT_R = 7.697117470131487;
const ZIGGURAT_V = 3.949659822581572e-3;
const ZIGGURAT_K = new Uint32Array(256);
const ZIGGURAT_W = new Float64Array(256);
const ZIGGURAT_F = new Float64Array(256);
{
  const m = 4294967296;
  let x = ZIGGURAT_R;
  let previous = x;
  const q = ZIGGURAT_V / Math.exp(-x);
  ZIGGURAT_K[0] = Math.floor((x / q) * m);
  ZIGGURAT_K[1] = 0;
  ZIGGURAT_W[0] = q / m;
  ZIGGURAT_W[255] = x / m;
  ZIGGURAT_F[0] = 1;
  ZIGGURAT_F[255] = Math.exp(-x);
  for (let i = 254; i >= 1; i--) {
    x = -Math.log(ZIGGURAT_V / x + Math.exp(-x));
    ZIGGURAT_K[i + 1] = Math.floor((x / previous) * m);
    previous = x;
    ZIGGURAT_F[i] = Math.exp(-x);
    ZIGGURAT_W[i] = x / m;
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

/**
 * A seeded generator.
 * @example createRng(42).uniform() // the same value on every run and machine
 */
export function createRng(seed: number): Rng {
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number, got ${seed}`);
  return new Xoshiro128(Math.trunc(seed));
}
