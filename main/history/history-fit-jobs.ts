// History fits as background jobs for the app: start one, poll its progress (fraction, ETA,
// the objective trace for a live chart), cancel it, and save a finished fit's bundle into the
// bundle library. Meant to run where the app's engine runs (a worker thread), behind the
// requests declared in shared/history/history-requests.ts.
//
// A job keeps its bundle in memory until it is saved; cancelling or failing saves nothing.
import type { Candidate } from '../../shared/delay/bundle/fit-bundle';
import type { PosteriorBundle } from '../../shared/delay/bundle/bundle-schema';
import type { PosteriorSource } from '../../shared/delay/predictive';
import { fitRouteHistory } from '../../shared/history/history-fit';
import { summariseHistoryFit } from '../../shared/history/history-fit-summary';
import { parseHoldoutAfter } from '../../shared/history/holdout';
import type { HistoryFitJobStatus, ObjectivePoint, StartHistoryFitArgs } from '../../shared/history/history-requests';
import type { BundleLibrary, LibraryEntry } from './bundle-library';
import { readHistoryFile } from './read-history-file';

const READ_SHARE = 0.2;
const MAX_TRACE = 2000;

export interface HistoryFitJobsDeps {
  /** The model to refit: the default bundle's choice. */
  readonly candidate: () => Promise<Candidate>;
  readonly library: BundleLibrary;
  /** The bundle in use, to score the held-out month against. */
  readonly baseline?: () => Promise<{ readonly name: string; readonly source: PosteriorSource } | null>;
  readonly now?: () => number;
}

interface Job {
  readonly id: string;
  readonly controller: AbortController;
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
    const id = `fit-${this.next++}`;
    const now = this.deps.now ?? (() => Date.now());
    const controller = new AbortController();
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
        const read = await readHistoryFile(args.path, { overrides: args.overrides, signal: controller.signal, onProgress: (p) => update(READ_SHARE * p.fraction, `reading: ${p.rows} rows`, 'reading') });
        const createdAt = new Date(now()).toISOString();
        const name = args.path.split(/[\\/]/).pop() ?? args.path;
        const result = await fitRouteHistory(read.table, {
          method: args.method ?? 'map',
          seed: args.seed ?? 1,
          candidate,
          cutoffDay,
          signal: controller.signal,
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
        const cancelled = controller.signal.aborted;
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
    if (job.status.state === 'done' || job.status.state === 'failed' || job.status.state === 'cancelled') return false;
    job.controller.abort();
    return true;
  }

  /** Saves a finished job's bundle into the library ("use this bundle" then calls library.use). */
  async save(jobId: string): Promise<LibraryEntry> {
    const job = this.job(jobId);
    if (job.status.state !== 'done' || !job.bundle) throw new Error(`fit ${jobId} has not finished successfully (${job.status.state}); there is no bundle to save`);
    return this.deps.library.add(job.bundle);
  }

  private job(jobId: string): Job {
    const job = this.jobs.get(jobId);
    if (!job) throw new Error(`no fit job '${jobId}'`);
    return job;
  }
}
