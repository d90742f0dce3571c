// Request specs for the app's history screens, listed in shared/api/contract.ts: argument and
// result schemas (valibot) for previewing a file's columns, running a fit as a job with
// progress, cancelling it, saving its bundle and choosing the bundle in use.
// history-fit-jobs.ts and the hosts' bundle stores implement them (shared/api/history-handlers.ts).
import * as v from 'valibot';
import { isBlobLike, type BlobLike } from './byte-source';
import { BundleViewSchema } from '../api/analysis-schema';
import { HISTORY_FIELDS } from './columns';
import { HISTORY_FIT_METHODS } from './fit-methods';
import type { HistoryFitSummary } from './history-fit-summary';

const FilePath = v.pipe(v.string(), v.minLength(1), v.maxLength(4096));
const JobId = v.pipe(v.string(), v.minLength(1), v.maxLength(100));
const ColumnName = v.pipe(v.string(), v.maxLength(400));
const Probability = v.pipe(v.number(), v.minValue(0), v.maxValue(1));

/** Per field a column name, or null for "not in this file". */
export const ColumnOverridesSchema = v.partial(v.strictObject(Object.fromEntries(HISTORY_FIELDS.map((f) => [f, v.nullable(ColumnName)])) as Record<(typeof HISTORY_FIELDS)[number], v.NullableSchema<typeof ColumnName, undefined>>));

export const HistoryPreviewSchema = v.object({
  format: v.picklist(['csv', 'parquet']),
  detection: v.object({
    header: v.array(v.string()),
    /** Column index per detected field. */
    mapping: v.record(v.picklist(HISTORY_FIELDS), v.pipe(v.number(), v.integer(), v.minValue(0))),
    missing: v.array(v.picklist(HISTORY_FIELDS)),
    layout: v.picklist(['bts', 'other']),
  }),
  sampleRows: v.array(v.array(v.string())),
});

/**
 * The file to read: a path the desktop app's file dialog returned (the main process only
 * forwards paths it handed out), or, in the plain page, the File the user picked.
 */
export const HistoryFileRefSchema = v.variant('kind', [
  v.strictObject({ kind: v.literal('path'), path: FilePath }),
  v.strictObject({ kind: v.literal('blob'), name: v.pipe(v.string(), v.minLength(1), v.maxLength(400)), blob: v.custom<BlobLike>(isBlobLike, 'expected a picked file') }),
]);
export type HistoryFileRef = v.InferOutput<typeof HistoryFileRefSchema>;

export const StartHistoryFitArgsSchema = v.strictObject({
  source: HistoryFileRefSchema,
  overrides: v.optional(ColumnOverridesSchema),
  method: v.optional(v.picklist(HISTORY_FIT_METHODS)),
  /** YYYY-MM-DD; flights after it are held out (default: the last month). */
  holdoutAfter: v.optional(v.pipe(v.string(), v.isoDate())),
  seed: v.optional(v.pipe(v.number(), v.integer(), v.minValue(0))),
});
export type StartHistoryFitArgs = v.InferOutput<typeof StartHistoryFitArgsSchema>;

export const ObjectivePointSchema = v.object({
  stage: v.picklist(['fit-holdout', 'evaluate', 'fit-all']),
  kind: v.picklist(['arrival', 'departure']),
  iteration: v.number(),
  /** The log posterior at that iteration. */
  objective: v.number(),
});
export type ObjectivePoint = v.InferOutput<typeof ObjectivePointSchema>;

const TailRowSchema = v.object({
  minutes: v.number(),
  observed: Probability,
  predicted: Probability,
  interval: v.tuple([Probability, Probability]),
  relativeError: v.nullable(v.number()),
  covered: v.boolean(),
});

const KindSummarySchema = v.object({
  flights: v.number(),
  natsPerFlight: v.number(),
  calibration: v.array(TailRowSchema),
  busiestRoutes: v.array(v.object({ origin: v.string(), destination: v.string(), flights: v.number(), rows: v.array(TailRowSchema) })),
  routeMedianAbsRelativeError: v.array(v.object({ minutes: v.number(), median: v.nullable(v.number()), routes: v.number() })),
  qq: v.array(v.object({ probability: Probability, observedMinutes: v.number(), predictedMinutes: v.number() })),
  baseline: v.nullable(v.object({ name: v.string(), natsPerFlight: v.number(), pooled: v.array(TailRowSchema) })),
});

/** The shape of shared/history/history-fit-summary.ts's HistoryFitSummary. */
export const HistoryFitSummarySchema = v.object({
  model: v.literal('route'),
  family: v.string(),
  method: v.picklist(HISTORY_FIT_METHODS),
  elapsedMs: v.number(),
  import: v.object({
    rows: v.number(),
    flights: v.number(),
    cancelled: v.number(),
    diverted: v.number(),
    invalid: v.number(),
    invalidByReason: v.array(
      v.object({ reason: v.string(), label: v.string(), count: v.number(), samples: v.array(v.object({ row: v.number(), cells: v.record(v.string(), v.string()) })) }),
    ),
    firstDate: v.nullable(v.string()),
    lastDate: v.nullable(v.string()),
  }),
  holdout: v.object({ holdoutAfter: v.string(), defaulted: v.boolean(), fitFlights: v.number(), heldOutFlights: v.number() }),
  heldOut: v.object({ arrival: KindSummarySchema, departure: v.nullable(KindSummarySchema) }),
  bundle: v.object({ id: v.string(), bytes: v.number(), flights: v.number(), routes: v.number(), airports: v.number(), departures: v.picklist(['fitted', 'derived']) }),
});

export const HistoryFitJobStatusSchema = v.object({
  jobId: JobId,
  state: v.picklist(['reading', 'fitting', 'done', 'failed', 'cancelled']),
  fraction: Probability,
  label: v.string(),
  elapsedMs: v.number(),
  /** Estimated time remaining; null until 2% is done. */
  etaMs: v.nullable(v.number()),
  /** The objective per reported iteration, for the live chart (at most a few thousand points). */
  trace: v.array(ObjectivePointSchema),
  summary: v.nullable(HistoryFitSummarySchema),
  error: v.nullable(v.string()),
});
export type HistoryFitJobStatus = Omit<v.InferOutput<typeof HistoryFitJobStatusSchema>, 'summary'> & {
  readonly summary: HistoryFitSummary | null;
};

export const ActiveBundleSchema = v.variant('kind', [v.strictObject({ kind: v.literal('default') }), v.strictObject({ kind: v.literal('library'), id: JobId })]);

const LibraryEntrySchema = v.object({
  id: v.string(),
  file: v.string(),
  active: v.boolean(),
  view: BundleViewSchema,
  createdAt: v.string(),
  departures: v.picklist(['fitted', 'derived']),
  heldOut: v.array(v.object({ candidate: v.string(), split: v.string(), flights: v.number(), natsPerFlight: v.number() })),
});

/**
 * The requests, as [argument tuple schema, result schema] for contract.ts's `request(...)`:
 * previewHistory(ref), startHistoryFit(args), historyFitStatus(jobId), cancelHistoryFit(jobId),
 * saveFittedBundle(jobId), listBundles(), useBundle(choice).
 */
export const HISTORY_REQUESTS = {
  previewHistory: { args: v.strictTuple([HistoryFileRefSchema]), result: HistoryPreviewSchema },
  startHistoryFit: { args: v.strictTuple([StartHistoryFitArgsSchema]), result: v.object({ jobId: JobId }) },
  historyFitStatus: { args: v.strictTuple([JobId]), result: HistoryFitJobStatusSchema },
  cancelHistoryFit: { args: v.strictTuple([JobId]), result: v.boolean() },
  saveFittedBundle: { args: v.strictTuple([JobId]), result: LibraryEntrySchema },
  listBundles: {
    args: v.strictTuple([]),
    result: v.object({
      /** The bundle that ships with the app, always available. */
      default: BundleViewSchema,
      entries: v.array(LibraryEntrySchema),
      unreadable: v.array(v.object({ file: v.string(), reason: v.string() })),
      active: ActiveBundleSchema,
    }),
  },
  useBundle: { args: v.strictTuple([ActiveBundleSchema]), result: ActiveBundleSchema },
} as const;
