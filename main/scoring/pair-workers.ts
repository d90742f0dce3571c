// Scoring on two threads: this one runs the simulation, and both this one and a helper thread
// solve the connection work (shared/risk/pair-jobs.ts), claiming its groups one at a time
// (group-claims.ts), so that whichever is free takes the next. The helper makes its own copy
// of the posterior source from a spec; every group's answers are the same on either thread, so the
// result is byte for byte that of scoreTrips on one thread. If the helper fails, what it had
// claimed is solved here instead.
import { Worker } from 'node:worker_threads';
import type { PosteriorSource } from '../../shared/delay/predictive';
import type { ParsedTrips } from '../../shared/itinerary/types';
import { solveGroup, solvePlan, type PairAnswer, type PairPlan } from '../../shared/risk/pair-jobs';
import { assembleScoring, prepareScoring, simulateScoring } from '../../shared/risk/score-trips';
import type { ScoredTrips, ScoreOptions } from '../../shared/risk/types';
import { claimNext, createClaims } from './group-claims';
import { checkPairReply, type JobAnswer, type PairRequest } from './pair-messages';

/**
 * Below this many groups, or jobs, of connection work a second thread is not worth starting: a
 * few dozen connections score in milliseconds, less than a thread takes to start.
 */
export const MIN_PARALLEL_GROUPS = 2;
export const MIN_PARALLEL_JOBS = 24;

type RemoteAnswers = readonly JobAnswer[];

interface Pending {
  readonly plan: PairPlan;
  readonly sourceId: string;
  readonly resolve: (answers: RemoteAnswers) => void;
  readonly reject: (err: Error) => void;
}

/**
 * One helper thread running a pair worker entry (an esbuild bundle that calls
 * servePairRequests). Started on first use, or by start(); a thread that dies fails its
 * pending requests and is started again by the next. It does not keep the process alive
 * while it has nothing to do.
 */
export class PairWorker {
  private worker: Worker | null = null;
  private readonly pending = new Map<number, Pending>();
  private nextId = 1;

  constructor(
    readonly file: string,
    private readonly makeWorker: (file: string) => Worker = (f) => new Worker(f),
  ) {}

  /** Starts the thread ahead of the first request. */
  start(): void {
    this.connect();
  }

  /** Asks the helper to claim and solve groups of `plan`; its answers, checked. */
  request(plan: PairPlan, source: unknown, sourceId: string, claims: SharedArrayBuffer): Promise<RemoteAnswers> {
    const worker = this.connect();
    const id = this.nextId++;
    return new Promise<RemoteAnswers>((resolve, reject) => {
      this.pending.set(id, { plan, sourceId, resolve, reject });
      worker.ref();
      const request: PairRequest = { id, source, plan, claims };
      worker.postMessage(request);
    });
  }

  async close(): Promise<void> {
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }

  private connect(): Worker {
    if (this.worker) return this.worker;
    const worker = this.makeWorker(this.file);
    worker.unref();
    worker.on('message', (message: unknown) => this.receive(worker, message));
    worker.on('error', (err) => this.failAll(worker, err instanceof Error ? err : new Error(String(err))));
    worker.on('exit', (code) => this.failAll(worker, new Error(`the pair worker stopped (exit code ${code})`)));
    this.worker = worker;
    return worker;
  }

  private receive(worker: Worker, message: unknown): void {
    const id = (message as { id?: unknown } | null)?.id;
    const pending = typeof id === 'number' ? this.pending.get(id) : undefined;
    if (!pending) return;
    this.pending.delete(id as number);
    if (this.pending.size === 0) worker.unref();
    try {
      const reply = checkPairReply(message, pending.plan);
      if ('error' in reply) throw new Error(`the pair worker failed: ${reply.error}`);
      if (reply.sourceId !== pending.sourceId) throw new Error(`the pair worker scored against ${reply.sourceId}, not ${pending.sourceId}`);
      pending.resolve(reply.answers);
    } catch (err) {
      pending.reject(err instanceof Error ? err : new Error(String(err)));
    }
  }

  private failAll(worker: Worker, err: Error): void {
    if (this.worker === worker) this.worker = null;
    for (const p of this.pending.values()) p.reject(err);
    this.pending.clear();
  }
}

/** What scoreInParallel reports besides the result (for the bench and for tests). */
export interface ParallelReport {
  /** Groups of connection work this thread solved, and the helper. */
  here: number;
  helper: number;
  /** Milliseconds this thread waited for the helper after its own share. */
  waitMs: number;
  /** Why the helper's share was solved here instead, if it was. */
  fallback?: string;
}

/**
 * scoreTrips on this thread and `helper`, or on this thread alone when helper is null or the
 * work is too small to share. `sourceSpec` is what the helper's source factory makes the same
 * posterior source from; the helper's source must report the same info.id.
 */
export async function scoreInParallel(
  parsed: ParsedTrips,
  source: PosteriorSource,
  sourceSpec: unknown,
  options: ScoreOptions,
  helper: PairWorker | null,
  report?: ParallelReport,
): Promise<ScoredTrips> {
  const prepared = prepareScoring(parsed, source, options);
  const { plan } = prepared;
  if (!helper || plan.groups.length < MIN_PARALLEL_GROUPS || plan.jobs.length < MIN_PARALLEL_JOBS) {
    if (report) {
      report.here = plan.groups.length;
      report.helper = 0;
      report.waitMs = 0;
      delete report.fallback;
    }
    return assembleScoring(prepared, solvePlan(source, plan), simulateScoring(prepared));
  }
  const claims = createClaims();
  const remote = helper.request(plan, sourceSpec, source.info.id, claims);
  // Never left unhandled: when this thread solves everything, the reply is not waited for.
  remote.catch(() => undefined);
  const sims = simulateScoring(prepared);
  const answers: (PairAnswer | undefined)[] = new Array(plan.jobs.length);
  const counter = new Int32Array(claims);
  let here = 0;
  for (let g = claimNext(counter, plan.groups.length); g >= 0; g = claimNext(counter, plan.groups.length), here++) solveGroup(source, plan, plan.groups[g]!, answers);
  let fallback: string | undefined;
  let waited = 0;
  if (plan.groups.some((group) => group.some((k) => !answers[k]))) {
    const waitFrom = performance.now();
    try {
      const delivered = await remote;
      waited = performance.now() - waitFrom;
      for (const a of delivered) answers[a.job] = { byDraw: a.byDraw, minLayover: a.minLayover };
    } catch (err) {
      fallback = err instanceof Error ? err.message : String(err);
    }
    for (const group of plan.groups) {
      if (group.some((k) => !answers[k])) {
        solveGroup(source, plan, group, answers);
        here++;
      }
    }
  }
  if (report) {
    report.here = here;
    report.waitMs = waited;
    report.helper = plan.groups.length - here;
    if (fallback !== undefined) report.fallback = fallback;
    else delete report.fallback;
  }
  return assembleScoring(prepared, answers as PairAnswer[], sims);
}
