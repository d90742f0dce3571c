// The No-U-Turn Sampler: multinomial NUTS with the generalised no-U-turn criterion, plus
// Stan-style warm-up (dual-averaging step size, windowed diagonal mass matrix), several
// chains, divergence counts and rank-normalised R-hat / ESS on the draws it returns.
//
// Sources: Hoffman & Gelman, "The No-U-Turn Sampler", JMLR 15 (2014), Algorithms 4-6
// (step-size search and dual averaging); Betancourt, "A Conceptual Introduction to
// Hamiltonian Monte Carlo", arXiv:1701.02434 (2017), section A.4 (multinomial sampling
// across the trajectory, biased progressive sampling between subtrees); the windowed
// adaptation schedule and the extra checks across merged subtrees follow the Stan
// reference manual, "MCMC sampling" chapter (Stan Development Team).
import { effectiveSampleSizeBulk, effectiveSampleSizeTail, splitRhat } from './diagnostics/convergence';
import { RunningMoments } from './diagnostics/running-moments';
import { FitDivergedError, FitLoop, initialPoint, type FitOptions, type FitResult } from './fit-types';
import type { Model } from './model';
import type { Rng } from './rng';

export interface NutsOptions extends FitOptions {
  /** Independent chains, run one after another (default 4). */
  readonly chains?: number;
  /** Warm-up iterations per chain, discarded (default 1000). */
  readonly warmup?: number;
  /** Kept draws per chain (default 1000). */
  readonly draws?: number;
  /** Tree-depth cap: at most 2^maxTreeDepth - 1 leapfrog steps per iteration (default 10). */
  readonly maxTreeDepth?: number;
  /** Dual-averaging target for the mean acceptance statistic (default 0.8, as in Stan). */
  readonly targetAccept?: number;
  /** Half-width of the uniform jitter added to the start point of each chain (default 1). */
  readonly initJitter?: number;
  /** Adapt a diagonal mass matrix in warm-up (default true). */
  readonly adaptMassMatrix?: boolean;
  /**
   * Reject the fit with FitDivergedError when more than this fraction of kept transitions
   * diverged (default 0.2): such draws do not represent the posterior.
   */
  readonly maxDivergentFraction?: number;
}

export interface NutsChainStats {
  readonly stepSize: number;
  /** The adapted diagonal of the inverse mass matrix (posterior variances, roughly). */
  readonly inverseMetric: Float64Array;
  readonly divergences: number;
  readonly warmupDivergences: number;
  /** Kept iterations whose tree hit maxTreeDepth. */
  readonly treeDepthSaturated: number;
  readonly meanAcceptStat: number;
  readonly gradientEvaluations: number;
}

export interface NutsResult extends FitResult {
  readonly method: 'nuts';
  readonly chains: number;
  readonly drawsPerChain: number;
  /** Kept draws in unconstrained space, [chain][draw][coordinate] flattened. */
  readonly samples: Float64Array;
  /** Log density of each kept draw, [chain][draw] flattened. */
  readonly logDensity: Float64Array;
  readonly chainStats: readonly NutsChainStats[];
  /** Rank-normalised split R-hat per coordinate (Vehtari et al. 2021). */
  readonly rhat: Float64Array;
  readonly essBulk: Float64Array;
  readonly essTail: Float64Array;
}

/** Stan's threshold on the energy error that marks a transition as divergent. */
const MAX_DELTA_H = 1000;

interface PhasePoint {
  q: Float64Array;
  p: Float64Array;
  g: Float64Array;
  lp: number;
}

function phasePoint(dim: number): PhasePoint {
  return { q: new Float64Array(dim), p: new Float64Array(dim), g: new Float64Array(dim), lp: NaN };
}

function copyPoint(to: PhasePoint, from: PhasePoint): void {
  to.q.set(from.q);
  to.p.set(from.p);
  to.g.set(from.g);
  to.lp = from.lp;
}

function logSumExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

/** Buffers one level of the tree recursion needs; level d serves every subtree of depth d. */
interface LevelBuffers {
  pInitEnd: Float64Array;
  pSharpInitEnd: Float64Array;
  rhoInit: Float64Array;
  pFinalBeg: Float64Array;
  pSharpFinalBeg: Float64Array;
  rhoFinal: Float64Array;
  zProposeFinal: PhasePoint;
}

/**
 * One chain's transition kernel. Every vector it touches is allocated once here, so a
 * transition allocates nothing however deep its tree grows.
 */
class NutsKernel {
  readonly dim: number;
  stepSize = 1;
  readonly invMetric: Float64Array;
  private readonly sqrtMetric: Float64Array;
  /** The current state of the chain (position, gradient, log density). */
  readonly current: PhasePoint;

  // Work point being integrated and the trajectory's bookkeeping.
  private readonly z: PhasePoint;
  private readonly zFwd: PhasePoint;
  private readonly zBck: PhasePoint;
  private readonly zSample: PhasePoint;
  private readonly zPropose: PhasePoint;
  private readonly pFwd: Float64Array;
  private readonly pBck: Float64Array;
  private readonly pSharpFwd: Float64Array;
  private readonly pSharpBck: Float64Array;
  private readonly pFwdBck: Float64Array;
  private readonly pSharpFwdBck: Float64Array;
  private readonly pBckFwd: Float64Array;
  private readonly pSharpBckFwd: Float64Array;
  private readonly rho: Float64Array;
  private readonly rhoFwd: Float64Array;
  private readonly rhoBck: Float64Array;
  private readonly levels: LevelBuffers[];

  // Per-transition outputs.
  leapfrogs = 0;
  private sumMetroProb = 0;
  divergent = false;
  depth = 0;
  acceptStat = 0;
  gradientEvaluations = 0;

  constructor(
    private readonly model: Model,
    private readonly rng: Rng,
    readonly maxTreeDepth: number,
  ) {
    const dim = model.dim;
    this.dim = dim;
    this.invMetric = new Float64Array(dim).fill(1);
    this.sqrtMetric = new Float64Array(dim).fill(1);
    this.current = phasePoint(dim);
    this.z = phasePoint(dim);
    this.zFwd = phasePoint(dim);
    this.zBck = phasePoint(dim);
    this.zSample = phasePoint(dim);
    this.zPropose = phasePoint(dim);
    const v = () => new Float64Array(dim);
    this.pFwd = v();
    this.pBck = v();
    this.pSharpFwd = v();
    this.pSharpBck = v();
    this.pFwdBck = v();
    this.pSharpFwdBck = v();
    this.pBckFwd = v();
    this.pSharpBckFwd = v();
    this.rho = v();
    this.rhoFwd = v();
    this.rhoBck = v();
    this.levels = [];
    for (let d = 0; d <= maxTreeDepth; d++) {
      this.levels.push({ pInitEnd: v(), pSharpInitEnd: v(), rhoInit: v(), pFinalBeg: v(), pSharpFinalBeg: v(), rhoFinal: v(), zProposeFinal: phasePoint(dim) });
    }
  }

  /** Sets the position and evaluates its density; returns false when it is not finite. */
  setPosition(theta: Float64Array): boolean {
    this.current.q.set(theta);
    this.current.lp = this.model.logDensityGrad(this.current.q, this.current.g);
    this.gradientEvaluations++;
    if (!Number.isFinite(this.current.lp)) return false;
    for (let i = 0; i < this.dim; i++) if (!Number.isFinite(this.current.g[i]!)) return false;
    return true;
  }

  setInverseMetric(values: Float64Array): void {
    for (let i = 0; i < this.dim; i++) {
      const v = values[i]!;
      this.invMetric[i] = v;
      this.sqrtMetric[i] = 1 / Math.sqrt(v);
    }
  }

  private samplePhase(z: PhasePoint): void {
    // p ~ N(0, M) with M = diag(1 / invMetric).
    for (let i = 0; i < this.dim; i++) z.p[i] = this.rng.normal() * this.sqrtMetric[i]!;
  }

  private hamiltonian(z: PhasePoint): number {
    let k = 0;
    for (let i = 0; i < this.dim; i++) {
      const pi = z.p[i]!;
      k += pi * pi * this.invMetric[i]!;
    }
    const h = -z.lp + 0.5 * k;
    return Number.isNaN(h) ? Infinity : h;
  }

  private leapfrog(z: PhasePoint, eps: number): void {
    const half = 0.5 * eps;
    const { q, p, g } = z;
    for (let i = 0; i < this.dim; i++) p[i] = p[i]! + half * g[i]!;
    for (let i = 0; i < this.dim; i++) q[i] = q[i]! + eps * this.invMetric[i]! * p[i]!;
    z.lp = this.model.logDensityGrad(q, g);
    this.gradientEvaluations++;
    for (let i = 0; i < this.dim; i++) p[i] = p[i]! + half * g[i]!;
  }

  private sharp(out: Float64Array, p: Float64Array): void {
    for (let i = 0; i < this.dim; i++) out[i] = this.invMetric[i]! * p[i]!;
  }

  /** The generalised no-U-turn criterion: both ends still move along the summed momentum. */
  private criterion(pSharpMinus: Float64Array, pSharpPlus: Float64Array, rho: Float64Array, extra: Float64Array | null): boolean {
    let a = 0;
    let b = 0;
    for (let i = 0; i < this.dim; i++) {
      const r = extra ? rho[i]! + extra[i]! : rho[i]!;
      a += pSharpPlus[i]! * r;
      b += pSharpMinus[i]! * r;
    }
    return a > 0 && b > 0;
  }

  /**
   * Builds a subtree of 2^depth leapfrog steps from this.z in direction `sign`, writing its
   * multinomial proposal into zPropose, its end momenta and summed momentum. Returns the
   * subtree's log sum of weights, or NaN when it diverged or turned back on itself.
   */
  private buildTree(depth: number, zPropose: PhasePoint, pSharpBeg: Float64Array, pSharpEnd: Float64Array, rho: Float64Array, pBeg: Float64Array, pEnd: Float64Array, h0: number, sign: number): number {
    if (depth === 0) {
      this.leapfrog(this.z, sign * this.stepSize);
      this.leapfrogs++;
      const h = this.hamiltonian(this.z);
      if (h - h0 > MAX_DELTA_H) this.divergent = true;
      const logWeight = h0 - h;
      this.sumMetroProb += logWeight > 0 ? 1 : Math.exp(logWeight);
      copyPoint(zPropose, this.z);
      this.sharp(pSharpBeg, this.z.p);
      pSharpEnd.set(pSharpBeg);
      rho.set(this.z.p);
      pBeg.set(this.z.p);
      pEnd.set(this.z.p);
      return this.divergent ? NaN : logWeight;
    }
    const lv = this.levels[depth]!;
    const wInit = this.buildTree(depth - 1, zPropose, pSharpBeg, lv.pSharpInitEnd, lv.rhoInit, pBeg, lv.pInitEnd, h0, sign);
    if (Number.isNaN(wInit)) return NaN;
    const wFinal = this.buildTree(depth - 1, lv.zProposeFinal, lv.pSharpFinalBeg, pSharpEnd, lv.rhoFinal, lv.pFinalBeg, pEnd, h0, sign);
    if (Number.isNaN(wFinal)) return NaN;

    const wSubtree = logSumExp(wInit, wFinal);
    // Multinomial choice between the halves (uniform progressive sampling inside a subtree).
    if (wFinal > wSubtree || this.rng.uniform() < Math.exp(wFinal - wSubtree)) copyPoint(zPropose, lv.zProposeFinal);

    for (let i = 0; i < this.dim; i++) rho[i] = lv.rhoInit[i]! + lv.rhoFinal[i]!;
    const persist =
      this.criterion(pSharpBeg, pSharpEnd, rho, null) &&
      this.criterion(pSharpBeg, lv.pSharpFinalBeg, lv.rhoInit, lv.pFinalBeg) &&
      this.criterion(lv.pSharpInitEnd, pSharpEnd, lv.rhoFinal, lv.pInitEnd);
    return persist ? wSubtree : NaN;
  }

  /** One NUTS transition from `current`; leaves the new state in `current`. */
  transition(): void {
    const { z } = this;
    copyPoint(z, this.current);
    this.samplePhase(z);
    copyPoint(this.zFwd, z);
    copyPoint(this.zBck, z);
    copyPoint(this.zSample, z);
    copyPoint(this.zPropose, z);
    this.sharp(this.pSharpFwd, z.p);
    this.pSharpBck.set(this.pSharpFwd);
    this.pFwd.set(z.p);
    this.pBck.set(z.p);
    this.rho.set(z.p);
    const h0 = this.hamiltonian(z);
    let logSumWeight = 0;
    this.leapfrogs = 0;
    this.sumMetroProb = 0;
    this.divergent = false;
    this.depth = 0;

    while (this.depth < this.maxTreeDepth) {
      let wSubtree: number;
      if (this.rng.uniform() > 0.5) {
        copyPoint(z, this.zFwd);
        this.rhoBck.set(this.rho);
        this.pBckFwd.set(this.pFwd);
        this.pSharpBckFwd.set(this.pSharpFwd);
        wSubtree = this.buildTree(this.depth, this.zPropose, this.pSharpFwdBck, this.pSharpFwd, this.rhoFwd, this.pFwdBck, this.pFwd, h0, 1);
        copyPoint(this.zFwd, z);
      } else {
        copyPoint(z, this.zBck);
        this.rhoFwd.set(this.rho);
        this.pFwdBck.set(this.pBck);
        this.pSharpFwdBck.set(this.pSharpBck);
        wSubtree = this.buildTree(this.depth, this.zPropose, this.pSharpBckFwd, this.pSharpBck, this.rhoBck, this.pBckFwd, this.pBck, h0, -1);
        copyPoint(this.zBck, z);
      }
      if (Number.isNaN(wSubtree)) break;
      this.depth++;

      // Biased progressive sampling between the old trajectory and the new subtree.
      if (wSubtree > logSumWeight || this.rng.uniform() < Math.exp(wSubtree - logSumWeight)) copyPoint(this.zSample, this.zPropose);
      logSumWeight = logSumExp(logSumWeight, wSubtree);

      for (let i = 0; i < this.dim; i++) this.rho[i] = this.rhoBck[i]! + this.rhoFwd[i]!;
      const persist =
        this.criterion(this.pSharpBck, this.pSharpFwd, this.rho, null) &&
        this.criterion(this.pSharpBck, this.pSharpFwdBck, this.rhoBck, this.pFwdBck) &&
        this.criterion(this.pSharpBckFwd, this.pSharpFwd, this.rhoFwd, this.pBckFwd);
      if (!persist) break;
    }
    this.acceptStat = this.leapfrogs > 0 ? this.sumMetroProb / this.leapfrogs : 0;
    copyPoint(this.current, this.zSample);
  }

  /**
   * A first step size: doubled or halved until one leapfrog step's acceptance crosses 0.8
   * (Hoffman & Gelman 2014, Algorithm 4, with Stan's threshold).
   */
  findStepSize(): boolean {
    const { z } = this;
    const once = () => {
      copyPoint(z, this.current);
      this.samplePhase(z);
      const h0 = this.hamiltonian(z);
      this.leapfrog(z, this.stepSize);
      return h0 - this.hamiltonian(z);
    };
    const threshold = Math.log(0.8);
    const direction = once() > threshold ? 1 : -1;
    for (let tries = 0; tries < 200; tries++) {
      const deltaH = once();
      if (direction === 1 ? !(deltaH > threshold) : !(deltaH < threshold)) return true;
      this.stepSize = direction === 1 ? this.stepSize * 2 : this.stepSize * 0.5;
      if (this.stepSize > 1e7 || this.stepSize < 1e-12) return false;
    }
    return true;
  }
}

/** Dual averaging of log step size (Hoffman & Gelman 2014, section 3.2.1, Algorithm 5). */
class StepSizeAdapter {
  private counter = 0;
  private sBar = 0;
  private xBar = 0;
  private mu = 0;
  private static readonly gamma = 0.05;
  private static readonly t0 = 10;
  private static readonly kappa = 0.75;

  constructor(private readonly delta: number) {}

  restart(stepSize: number): void {
    this.counter = 0;
    this.sBar = 0;
    this.xBar = 0;
    this.mu = Math.log(10 * stepSize);
  }

  learn(acceptStat: number): number {
    this.counter++;
    const a = Math.min(1, acceptStat);
    const eta = 1 / (this.counter + StepSizeAdapter.t0);
    this.sBar = (1 - eta) * this.sBar + eta * (this.delta - a);
    const x = this.mu - (this.sBar * Math.sqrt(this.counter)) / StepSizeAdapter.gamma;
    const xEta = Math.pow(this.counter, -StepSizeAdapter.kappa);
    this.xBar = (1 - xEta) * this.xBar + xEta * x;
    return Math.exp(x);
  }

  final(): number {
    return Math.exp(this.xBar);
  }
}

/**
 * Stan's warm-up windows: a fast initial buffer (step size only), slow windows doubling in
 * length that each end with a mass-matrix update, and a fast terminal buffer.
 */
export function warmupWindowEnds(warmup: number): { start: number; ends: number[]; stop: number } {
  if (warmup < 20) return { start: warmup, ends: [], stop: warmup };
  let init = 75;
  let term = 50;
  let base = 25;
  if (init + base + term > warmup) {
    init = Math.floor(0.15 * warmup);
    term = Math.floor(0.1 * warmup);
    base = warmup - init - term;
  }
  const stop = warmup - term;
  const ends: number[] = [];
  let size = base;
  let end = init + size - 1;
  for (;;) {
    ends.push(end);
    if (end === stop - 1) break;
    size *= 2;
    end += size;
    // A window that would leave less than its successor's length before the terminal buffer
    // absorbs the remainder instead.
    if (end + 2 * size >= stop) end = stop - 1;
  }
  return { start: init, ends, stop };
}

/**
 * The window's variance, shrunk toward 1e-3 as Stan does so that short windows stay
 * well-posed; restarts the estimator for the next window.
 */
function regularisedVariance(moments: RunningMoments, out: Float64Array): void {
  const n = moments.count;
  for (let i = 0; i < out.length; i++) {
    const v = n > 1 ? moments.variance(i) : 1;
    out[i] = (n / (n + 5)) * v + 1e-3 * (5 / (n + 5));
  }
  moments.reset();
}

function positiveInt(name: string, value: number, min: number): number {
  if (!Number.isInteger(value) || value < min) throw new RangeError(`${name} must be a whole number >= ${min}, got ${value}`);
  return value;
}

/** Per-coordinate mean, sd, R-hat and bulk / tail ESS of draws laid out [chain][draw][coordinate]. */
export function summariseSamples(samples: Float64Array, chains: number, drawsPerChain: number, dim: number) {
  const total = chains * drawsPerChain;
  const mean = new Float64Array(dim);
  const sd = new Float64Array(dim);
  const rhat = new Float64Array(dim);
  const essBulk = new Float64Array(dim);
  const essTail = new Float64Array(dim);
  const column = new Float64Array(total);
  for (let i = 0; i < dim; i++) {
    let m = 0;
    for (let k = 0; k < total; k++) {
      const x = samples[k * dim + i]!;
      column[k] = x;
      m += x;
    }
    m /= total;
    let v = 0;
    for (let k = 0; k < total; k++) v += (column[k]! - m) ** 2;
    mean[i] = m;
    sd[i] = Math.sqrt(v / (total - 1));
    rhat[i] = splitRhat(column, chains);
    essBulk[i] = effectiveSampleSizeBulk(column, chains);
    essTail[i] = effectiveSampleSizeTail(column, chains);
  }
  return { mean, sd, rhat, essBulk, essTail };
}

/** The worst R-hat (NaN counts as Infinity) and the smallest ESS over coordinates. */
export function convergenceSummary(rhat: Float64Array, essBulk: Float64Array, essTail: Float64Array): { maxRhat: number; minEssBulk: number; minEssTail: number } {
  return {
    maxRhat: rhat.reduce((a, b) => Math.max(a, Number.isNaN(b) ? Infinity : b), 0),
    minEssBulk: essBulk.reduce((a, b) => Math.min(a, b), Infinity),
    minEssTail: essTail.reduce((a, b) => Math.min(a, b), Infinity),
  };
}

/**
 * Draws from the posterior of `model` with NUTS.
 *
 * Throws RangeError for invalid options; rejects with FitDivergedError when no chain can
 * start from a finite density, when no usable step size exists, or when more than
 * `maxDivergentFraction` of kept transitions diverged; rejects with FitAbortedError on abort.
 */
export async function nuts(model: Model, options: NutsOptions): Promise<NutsResult> {
  const dim = positiveInt('model.dim', model.dim, 1);
  const chains = positiveInt('chains', options.chains ?? 4, 1);
  const warmup = positiveInt('warmup', options.warmup ?? 1000, 0);
  const drawsPerChain = positiveInt('draws', options.draws ?? 1000, 2);
  const maxTreeDepth = positiveInt('maxTreeDepth', options.maxTreeDepth ?? 10, 1);
  const delta = options.targetAccept ?? 0.8;
  if (!(delta > 0 && delta < 1)) throw new RangeError(`targetAccept must lie in (0, 1), got ${delta}`);
  const jitter = options.initJitter ?? 1;
  if (!(jitter >= 0) || !Number.isFinite(jitter)) throw new RangeError(`initJitter must be finite and >= 0, got ${jitter}`);
  const maxDivergentFraction = options.maxDivergentFraction ?? 0.2;
  const perChain = warmup + drawsPerChain;
  if (options.maxIterations !== undefined && perChain > options.maxIterations) {
    throw new RangeError(`warm-up plus draws (${perChain}) exceeds maxIterations (${options.maxIterations})`);
  }
  const adaptMetric = options.adaptMassMatrix ?? true;
  const start = initialPoint(model, options);
  const totalIterations = chains * perChain;
  const loop = new FitLoop('nuts', options, totalIterations);

  const samples = new Float64Array(chains * drawsPerChain * dim);
  const logDensity = new Float64Array(chains * drawsPerChain);
  const chainStats: NutsChainStats[] = [];
  const windows = warmupWindowEnds(warmup);
  const theta = new Float64Array(dim);
  const variance = new Float64Array(dim);
  let iteration = 0;
  let objective = NaN;

  for (let c = 0; c < chains; c++) {
    const rng = options.rng.split();
    const kernel = new NutsKernel(model, rng, maxTreeDepth);
    // Jittered starts spread the chains (so R-hat can see disagreement), but a jitter can land
    // where the density is finite yet so steep that no step size works (a Gumbel scale shrunk
    // far below the data's spread). Such starts are retried closer in, ending at `start` itself.
    let started = false;
    let finite = false;
    for (let attempt = 0; attempt < 30 && !started; attempt++) {
      const width = attempt === 29 ? 0 : jitter / (1 + attempt);
      for (let i = 0; i < dim; i++) theta[i] = start[i]! + width * (2 * rng.uniform() - 1);
      if (!kernel.setPosition(theta)) continue;
      finite = true;
      kernel.stepSize = 1;
      started = kernel.findStepSize();
    }
    if (!finite) throw new FitDivergedError('nuts', iteration, `the log density or its gradient is not finite at the start point of chain ${c + 1} (nor near it)`);
    if (!started) throw new FitDivergedError('nuts', iteration, `no usable step size found for chain ${c + 1}; the posterior may be improper or discontinuous`);
    const adapter = new StepSizeAdapter(delta);
    adapter.restart(kernel.stepSize);
    const estimator = new RunningMoments(dim);
    let nextWindow = 0;
    let warmupDivergences = 0;
    let divergences = 0;
    let saturated = 0;
    let acceptSum = 0;
    let lpSum = 0;

    for (let t = 0; t < perChain; t++) {
      kernel.transition();
      const lp = kernel.current.lp;
      if (t < warmup) {
        if (kernel.divergent) warmupDivergences++;
        kernel.stepSize = adapter.learn(kernel.acceptStat);
        if (adaptMetric && t >= windows.start && t < windows.stop) {
          estimator.push(kernel.current.q);
          if (t === windows.ends[nextWindow]) {
            nextWindow++;
            regularisedVariance(estimator, variance);
            kernel.setInverseMetric(variance);
            kernel.findStepSize();
            adapter.restart(kernel.stepSize);
          }
        }
        if (t === warmup - 1) kernel.stepSize = adapter.final();
      } else {
        const k = c * drawsPerChain + (t - warmup);
        samples.set(kernel.current.q, k * dim);
        logDensity[k] = lp;
        if (kernel.divergent) divergences++;
        if (kernel.depth >= maxTreeDepth) saturated++;
        acceptSum += kernel.acceptStat;
        lpSum += lp;
      }
      iteration++;
      objective = lp;
      await loop.tick(iteration, objective);
    }
    chainStats.push({
      stepSize: kernel.stepSize,
      inverseMetric: Float64Array.from(kernel.invMetric),
      divergences,
      warmupDivergences,
      treeDepthSaturated: saturated,
      meanAcceptStat: acceptSum / drawsPerChain,
      gradientEvaluations: kernel.gradientEvaluations,
    });
    objective = lpSum / drawsPerChain;
  }

  const totalDraws = chains * drawsPerChain;
  const divergences = chainStats.reduce((s, c) => s + c.divergences, 0);
  if (divergences > maxDivergentFraction * totalDraws) {
    throw new FitDivergedError('nuts', iteration, `${divergences} of ${totalDraws} kept transitions diverged (limit ${Math.round(maxDivergentFraction * 100)}%); the posterior has regions the sampler cannot explore`);
  }

  const { mean, sd, rhat, essBulk, essTail } = summariseSamples(samples, chains, drawsPerChain, dim);
  let lpMean = 0;
  for (let k = 0; k < totalDraws; k++) lpMean += logDensity[k]!;
  lpMean /= totalDraws;
  const elapsedMs = loop.finish(iteration, lpMean);
  const saturatedTotal = chainStats.reduce((s, c) => s + c.treeDepthSaturated, 0);

  return {
    method: 'nuts',
    names: model.names.slice(),
    iterations: iteration,
    elapsedMs,
    // Vehtari et al. (2021) recommend R-hat < 1.01 before trusting the draws.
    converged: convergenceSummary(rhat, essBulk, essTail).maxRhat < 1.01 && divergences === 0,
    objective: lpMean,
    mean,
    sd,
    chains,
    drawsPerChain,
    samples,
    logDensity,
    chainStats,
    rhat,
    essBulk,
    essTail,
    draws(rng: Rng, count: number): Float64Array {
      positiveInt('count', count, 1);
      if (count === totalDraws) return Float64Array.from(samples);
      const out = new Float64Array(count * dim);
      for (let k = 0; k < count; k++) {
        const src = rng.int(totalDraws) * dim;
        out.set(samples.subarray(src, src + dim), k * dim);
      }
      return out;
    },
    diagnostics: {
      chains,
      drawsPerChain,
      warmup,
      divergences,
      warmupDivergences: chainStats.reduce((s, c) => s + c.warmupDivergences, 0),
      treeDepthSaturated: saturatedTotal,
      maxTreeDepth,
      meanAcceptStat: chainStats.reduce((s, c) => s + c.meanAcceptStat, 0) / chains,
      stepSize: chainStats.reduce((s, c) => s + c.stepSize, 0) / chains,
      gradientEvaluations: chainStats.reduce((s, c) => s + c.gradientEvaluations, 0),
      ...convergenceSummary(rhat, essBulk, essTail),
    },
  };
}
