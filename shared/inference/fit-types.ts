// The options, progress, result and error types every inference algorithm shares (MAP,
// ADVI, full-rank ADVI, SVI, NUTS), plus the small loop controls they all use: abort
// checks, progress throttling and yielding to the event loop so a worker stays responsive.
import type { Model } from './model';
import type { Rng } from './rng';

export type FitMethod = 'map' | 'advi' | 'fullrank' | 'svi' | 'nuts';

/**
 * The part of AbortSignal the algorithms read.
 *
 * shared/ compiles without DOM or Node types, so AbortSignal is not nameable here; any real
 * AbortSignal satisfies this shape.
 */
export interface CancelSignal {
  readonly aborted: boolean;
  readonly reason?: unknown;
}

export interface FitProgress {
  /** Fraction of the iteration budget used, in [0, 1]; reaches 1 when the fit ends. */
  readonly fraction: number;
  /** The current objective: log density for MAP, ELBO estimate for VI, mean log density for NUTS. */
  readonly objective: number;
  readonly iteration: number;
}

export interface FitOptions {
  /** Seeded generator: every fit is reproducible from its seed. */
  readonly rng: Rng;
  /** Hard cap on iterations (optimiser steps, or NUTS warm-up plus draws). */
  readonly maxIterations?: number;
  /** Convergence tolerance on the algorithm's own rule (relative objective change for MAP and VI). */
  readonly tolerance?: number;
  /** Starting point in unconstrained space (length model.dim); defaults to the model's own or zeros. */
  readonly init?: Float64Array;
  /** Called at most every `progressIntervalMs` and once at the end. */
  readonly onProgress?: (progress: FitProgress) => void;
  readonly progressIntervalMs?: number;
  /** Aborting rejects the fit with a FitAbortedError at the next check (a few milliseconds). */
  readonly signal?: CancelSignal;
}

/** Diagnostics are flat name -> value pairs so they print and serialise as they are. */
export type FitDiagnostics = Readonly<Record<string, number | string | boolean>>;

export interface FitResult {
  readonly method: FitMethod;
  /** Coordinate names, copied from the model. */
  readonly names: readonly string[];
  readonly iterations: number;
  readonly elapsedMs: number;
  /** True when the convergence rule fired; false when the iteration cap ended the fit. */
  readonly converged: boolean;
  /** Final objective, in the sense of FitProgress.objective. */
  readonly objective: number;
  /** Posterior mean in unconstrained space (MAP: the mode). */
  readonly mean: Float64Array;
  /** Posterior sd in unconstrained space (MAP: from the inverse Hessian approximation at the mode). */
  readonly sd: Float64Array;
  /**
   * `count` posterior draws in unconstrained space, row-major (count x dim). VI draws from its
   * approximation; NUTS returns (resamples, if count differs) its stored draws; MAP draws
   * from the Laplace approximation it reports as `sd`/covariance.
   */
  draws(rng: Rng, count: number): Float64Array;
  /** VI only: log q(θ) of the fitted approximation, normalised (for importance-sampling diagnostics such as PSIS). */
  logApproxDensity?(theta: Float64Array): number;
  readonly diagnostics: FitDiagnostics;
}

export type FitAlgorithm<O extends FitOptions = FitOptions> = (model: Model, options: O) => Promise<FitResult>;

/** The objective or its gradient became NaN or infinite, or the iterates ran away. */
export class FitDivergedError extends Error {
  constructor(
    readonly method: FitMethod,
    readonly iteration: number,
    detail: string,
  ) {
    super(`${method} diverged at iteration ${iteration}: ${detail}`);
    this.name = 'FitDivergedError';
  }
}

export class FitAbortedError extends Error {
  constructor(
    readonly method: FitMethod,
    readonly iteration: number,
  ) {
    super(`${method} was cancelled at iteration ${iteration}`);
    this.name = 'FitAbortedError';
  }
}

type TimerHost = { setTimeout?: (callback: () => void, ms: number) => unknown };

/**
 * Let queued events (an abort, a worker message) run before the loop continues.
 *
 * shared/ has no timer types, so setTimeout is looked up on globalThis; every runtime we
 * target (Node, workers, pages) has it. Without it a resolved promise is the best we can do.
 */
export function yieldToEventLoop(): Promise<void> {
  const host = globalThis as TimerHost;
  const timer = host.setTimeout;
  if (typeof timer !== 'function') return Promise.resolve();
  return new Promise((resolve) => {
    timer(resolve, 0);
  });
}

/**
 * Loop bookkeeping shared by every algorithm: progress throttling, cancellation checks and
 * periodic yielding. Call `tick` once per iteration; it is cheap unless a report or yield is due.
 */
export class FitLoop {
  readonly startMs = Date.now();
  private lastReportMs = -Infinity;
  private lastYieldMs = Date.now();
  private readonly intervalMs: number;

  constructor(
    readonly method: FitMethod,
    private readonly options: FitOptions,
    readonly maxIterations: number,
    /** How often (ms) the loop lets the event loop run, so aborts and messages arrive. */
    private readonly yieldEveryMs = 25,
  ) {
    this.intervalMs = options.progressIntervalMs ?? 100;
  }

  /** Throws FitAbortedError if cancelled; may await a macrotask; reports progress when due. */
  async tick(iteration: number, objective: number): Promise<void> {
    const now = Date.now();
    if (now - this.lastYieldMs >= this.yieldEveryMs) {
      this.lastYieldMs = now;
      if (this.options.signal) await yieldToEventLoop();
    }
    this.checkAborted(iteration);
    if (this.options.onProgress && now - this.lastReportMs >= this.intervalMs) {
      this.lastReportMs = now;
      this.options.onProgress({ fraction: Math.min(1, iteration / this.maxIterations), objective, iteration });
    }
  }

  checkAborted(iteration: number): void {
    if (this.options.signal?.aborted) throw new FitAbortedError(this.method, iteration);
  }

  /** The final report: fraction 1. */
  finish(iteration: number, objective: number): number {
    this.options.onProgress?.({ fraction: 1, objective, iteration });
    return Date.now() - this.startMs;
  }
}

/** Resolve a starting point: the caller's, else the model's, else zeros. Checks its length. */
export function initialPoint(model: Model, options: FitOptions): Float64Array {
  const theta = new Float64Array(model.dim);
  if (options.init) {
    if (options.init.length !== model.dim) throw new RangeError(`init has length ${options.init.length}, model.dim is ${model.dim}`);
    theta.set(options.init);
  } else if (model.initialPoint) {
    model.initialPoint(theta);
  }
  for (let i = 0; i < theta.length; i++) {
    if (!Number.isFinite(theta[i])) throw new RangeError(`initial point coordinate ${model.names[i] ?? i} is not finite`);
  }
  return theta;
}
