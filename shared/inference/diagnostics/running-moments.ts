// Running mean and variance of vector-valued draws, one pass, no storage of the draws
// (Welford, "Note on a method for calculating corrected sums of squares and products",
// Technometrics 4, 1962).

export class RunningMoments {
  private n = 0;
  private readonly means: Float64Array;
  private readonly m2: Float64Array;

  constructor(readonly dim: number) {
    this.means = new Float64Array(dim);
    this.m2 = new Float64Array(dim);
  }

  get count(): number {
    return this.n;
  }

  /** Adds one draw (length dim). */
  push(x: Float64Array): void {
    this.n++;
    for (let i = 0; i < this.dim; i++) {
      const d = x[i]! - this.means[i]!;
      this.means[i] = this.means[i]! + d / this.n;
      this.m2[i] = this.m2[i]! + d * (x[i]! - this.means[i]!);
    }
  }

  mean(i: number): number {
    return this.n > 0 ? this.means[i]! : NaN;
  }

  /** Sample variance (n - 1 denominator); NaN with fewer than 2 draws. */
  variance(i: number): number {
    return this.n > 1 ? this.m2[i]! / (this.n - 1) : NaN;
  }

  reset(): void {
    this.n = 0;
    this.means.fill(0);
    this.m2.fill(0);
  }
}
