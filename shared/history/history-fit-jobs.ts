// History fits as background jobs for the app: start one, poll its progress (fraction, ETA,
// the objective trace for a live chart), cancel it, and save a finished fit's bundle into the
// bundle library. Runs where the app's engine runs (the Electron engine thread, the page's
// Web Worker), behind the requests declared in history-requests.ts; the host passes how to
// read a file reference and where bundles are kept.
//
// A job keeps its bundle in memory until it is saved; cancelling or failing saves nothing.
import type { Candidate } from '../delay/bundle/fit-bundle';
import type { PosteriorBundle } from '../delay/bundle/bundle-schema';
import type { PosteriorSource } from '../delay/predictive';
import type { BundleStore, LibraryEntry } from './bundle-store';
import { fitRouteHistory } from './history-fit';
import { summariseHistoryFit } from './history-fit-summary';
import { parseHoldoutAfter } from './holdout';
import type { HistoryFileRef, HistoryFitJobStatus, ObjectivePoint, StartHistoryFitArgs } from './history-requests';
import type { HistoryReadOptions, HistoryReadResult } from './read-history-source';

const READ_SHARE = 0.2;

/** The file's own name, for the bundle's id and provenance. */
export function refName(ref: HistoryFileRef): string {
  return ref.kind === 'path' ? (ref.path.split(/[\\/]/).pop() ?? ref.path) : ref.name;
}
const MAX_TRACE = 2000;
/** Finished jobs kept for their status and bundle; older ones are forgotten. */
const KEPT_FINISHED = 3;

function isFinished(state: HistoryFitJobStatus['state']): boolean {
  return state === 'done' || state === 'failed' || state === 'cancelled';
}

export interface HistoryFitJobsDeps {
  /** The model to refit: the default bundle's choice. */
  readonly candidate: () => Promise<Candidate>;
  readonly library: BundleStore;
  /** Reads the referenced file (the host knows how to open a path or a picked file). */
  readonly read: (ref: HistoryFileRef, options: HistoryReadOptions) => Promise<HistoryReadResult>;
  /** The bundle in use, to score the held-out month against. */
  readonly baseline?: () => Promise<{ readonly name: string; readonly source: PosteriorSource } | null>;
  readonly now?: () => number;
}

interface Job {
  readonly id: string;
  readonly controller: { aborted: boolean; reason?: unknown };
  readonly startedMs: number;
  status: HistoryFitJobStatus;
  bundle: PosteriorBundle | null;
  done: Promise<void>;
}

export class HistoryFitJobs {
  private readonly jobs = new Map<string, Job>();
  private next = 1;

  constructor(private readonly deps: HistoryFitJobsDeps) {}

  /** Starts a fit and returns its id at once; the work continues in the background. */
  start(args: StartHistoryFitArgs): { jobId: string } {
    // One fit at a time: two would halve each other's speed and the user sees one progress bar.
    const running = [...this.jobs.values()].find((j) => !isFinished(j.status.state));
    if (running) throw new Error(`a fit is already running (${running.id}); wait for it or cancel it first`);
    this.prune();
    const id = `fit-${this.next++}`;
    const now = this.deps.now ?? (() => Date.now());
    // A plain flag object: the fits and readers take any { aborted } signal, and shared/ has no DOM types.
    const controller: Job['controller'] = { aborted: false };
    const startedMs = now();
    const trace: ObjectivePoint[] = [];
    const job: Job = {
      id,
      controller,
      startedMs,
      bundle: null,
      status: { jobId: id, state: 'reading', fraction: 0, label: 'reading the file', elapsedMs: 0, etaMs: null, trace, summary: null, error: null },
      done: Promise.resolve(),
    };
    const update = (fraction: number, label: string, state: HistoryFitJobStatus['state']) => {
      const elapsedMs = now() - startedMs;
      job.status = { ...job.status, state, fraction, label, elapsedMs, etaMs: fraction >= 0.02 && fraction < 1 ? (elapsedMs / fraction) * (1 - fraction) : null };
    };
    const run = async () => {
      try {
        const cutoffDay = args.holdoutAfter === undefined ? undefined : parseHoldoutAfter(args.holdoutAfter);
        const [candidate, baseline] = await Promise.all([this.deps.candidate(), this.deps.baseline?.() ?? Promise.resolve(null)]);
        const read = await this.deps.read(args.source, { overrides: args.overrides, signal: controller, onProgress: (p) => update(READ_SHARE * p.fraction, `reading: ${p.rows} rows`, 'reading') });
        const createdAt = new Date(now()).toISOString();
        const name = refName(args.source);
        const result = await fitRouteHistory(read.table, {
          method: args.method ?? 'map',
          seed: args.seed ?? 1,
          candidate,
          cutoffDay,
          signal: controller,
          baseline: baseline ?? undefined,
          onProgress: (p) => {
            update(READ_SHARE + (1 - READ_SHARE) * p.fraction, p.label, 'fitting');
            if (Number.isFinite(p.objective)) {
              trace.push({ stage: p.stage, kind: p.kind, iteration: p.iteration, objective: p.objective });
              // Keep the chart's data bounded: drop every other point when full.
              if (trace.length > MAX_TRACE) for (let i = trace.length - 1; i > 0; i -= 2) trace.splice(i, 1);
            }
          },
          metadata: {
            id: `history-${name.replace(/[^A-Za-z0-9._-]/g, '_')}-${createdAt.replace(/[-:]/g, '').slice(0, 15)}`,
            title: `Route posteriors fitted to ${name}`,
            source: `${name}: a delay history imported by the user (${read.table.summary.rows} rows)`,
            license: "the user's own data",
            createdAt,
          },
        });
        job.bundle = result.bundle;
        update(1, 'done', 'done');
        job.status = { ...job.status, summary: summariseHistoryFit(result, candidate, JSON.stringify(result.bundle).length) };
      } catch (err) {
        const cancelled = controller.aborted;
        update(job.status.fraction, cancelled ? 'cancelled' : 'failed', cancelled ? 'cancelled' : 'failed');
        job.status = { ...job.status, error: cancelled ? 'the fit was cancelled; nothing was saved' : err instanceof Error ? err.message : String(err) };
      }
    };
    this.jobs.set(id, job);
    job.done = run();
    return { jobId: id };
  }

  status(jobId: string): HistoryFitJobStatus {
    return this.job(jobId).status;
  }

  /** Resolves when the job has finished, whatever its outcome. */
  async wait(jobId: string): Promise<HistoryFitJobStatus> {
    const job = this.job(jobId);
    await job.done;
    return job.status;
  }

  /** Asks a running job to stop; false when it had already finished. */
  cancel(jobId: string): boolean {
    const job = this.job(jobId);
    if (isFinished(job.status.state)) return false;
    job.controller.aborted = true;
    return true;
  }

  /** Saves a finished job's bundle into the library ("use this bundle" then calls library.use). */
  async save(jobId: string): Promise<LibraryEntry> {
    const job = this.job(jobId);
    if (job.status.state !== 'done' || !job.bundle) throw new Error(`fit ${jobId} has not finished successfully (${job.status.state}); there is no bundle to save`);
    return this.deps.library.add(job.bundle);
  }

  /** Forgets the oldest finished jobs (each may hold a bundle of several MB). */
  private prune(): void {
    const finished = [...this.jobs.values()].filter((j) => isFinished(j.status.state));
    for (const j of finished.slice(0, Math.max(0, finished.length - KEPT_FINISHED + 1))) this.jobs.delete(j.id);
  }

  private job(jobId: string): Job {
    const job = this.jobs.get(jobId);
    if (!job) throw new Error(`no fit job '${jobId}'`);
    return job;
  }
}
