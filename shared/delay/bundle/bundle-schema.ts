// The versioned file format of a route-posterior bundle, checked on load.
//
// A bundle stores each route's approximate posterior (mean and Cholesky factor of a Gaussian
// over the route's unconstrained parameters), the airport effects and population
// hyperparameters for routes and airports absent from the data, and its provenance.
import * as v from 'valibot';

export const BUNDLE_FORMAT = 'layline.route-posteriors';
export const BUNDLE_VERSION = 1;

const finite = v.pipe(v.number(), v.finite());
const probability = v.pipe(v.number(), v.minValue(0), v.maxValue(1));
const nonNegative = v.pipe(v.number(), v.minValue(0));
const code = v.pipe(v.string(), v.regex(/^[A-Z0-9]{3}$/, 'an airport code must be three letters or digits'));

const TailRowSchema = v.strictObject({
  minutes: finite,
  observed: probability,
  predicted: probability,
  interval: v.strictTuple([probability, probability]),
  relativeError: v.nullable(finite),
  covered: v.boolean(),
});

export const HeldOutReportSchema = v.strictObject({
  candidate: v.string(),
  /** 'held-out days' (every fifth calendar day) or 'future month' (fit January-May, predict June). */
  split: v.string(),
  flights: nonNegative,
  natsPerFlight: v.number(),
  pooled: v.array(TailRowSchema),
  routeMedianAbsRelativeError: v.array(v.strictObject({ minutes: finite, median: v.nullable(finite), routes: nonNegative })),
  qq: v.optional(v.array(v.strictObject({ probability, observedMinutes: finite, predictedMinutes: finite }))),
  fitMs: v.optional(nonNegative),
});
export type HeldOutReport = v.InferOutput<typeof HeldOutReportSchema>;

const DiagnosticsSchema = v.record(v.string(), v.union([v.number(), v.string(), v.boolean()]));

const GaussianSchema = v.strictObject({ mean: finite, sd: nonNegative });

export const BundleSchema = v.strictObject({
  format: v.literal(BUNDLE_FORMAT),
  version: v.literal(BUNDLE_VERSION),
  id: v.pipe(v.string(), v.minLength(1)),
  metadata: v.strictObject({
    title: v.string(),
    source: v.string(),
    license: v.string(),
    dateRange: v.strictObject({ first: v.pipe(v.string(), v.isoDate()), last: v.pipe(v.string(), v.isoDate()) }),
    flights: nonNegative,
    routes: nonNegative,
    airports: nonNegative,
    model: v.string(),
    method: v.string(),
    fitMs: nonNegative,
    createdAt: v.string(),
    cleaning: v.string(),
    diagnostics: DiagnosticsSchema,
    selection: v.string(),
    comparison: v.array(HeldOutReportSchema),
    notes: v.array(v.string()),
  }),
  model: v.strictObject({
    family: v.picklist(['gumbel', 'gumbel-gumbel', 'gumbel-t', 'gumbel-lomax', 'gumbel-gumbel-lomax']),
    parameters: v.array(v.string()),
    /** Indices into parameters that carry a calendar-month random effect. */
    monthEffects: v.array(v.pipe(v.number(), v.integer(), v.minValue(0))),
  }),
  population: v.strictObject({
    mean: v.array(finite),
    routeSd: v.array(nonNegative),
    originSd: v.array(nonNegative),
    destinationSd: v.array(nonNegative),
    /** Per month effect: the posterior of the log sd of a new month's effect about the average month, as a Gaussian. */
    monthLogSd: v.array(GaussianSchema),
    /** Student-t degrees of freedom: the posterior of log df (null without a t component). */
    logDf: v.nullable(GaussianSchema),
  }),
  airports: v.strictObject({
    codes: v.array(code),
    /** Per airport, per parameter: conditional posterior mean and sd of its origin and destination effects. */
    originMean: v.array(v.array(finite)),
    originSd: v.array(v.array(nonNegative)),
    destinationMean: v.array(v.array(finite)),
    destinationSd: v.array(v.array(nonNegative)),
  }),
  months: v.strictObject({
    labels: v.array(v.pipe(v.string(), v.regex(/^\d{4}-\d{2}$/))),
    /** Fitted effect per month label and month-effect parameter. */
    effects: v.array(v.array(finite)),
  }),
  routes: v.strictObject({
    /** Per route: origin index, destination index, flights, k means, k(k+1)/2 Cholesky entries (row-major lower triangle). */
    rows: v.array(v.array(finite)),
  }),
  departure: v.strictObject({
    derived: v.boolean(),
    offsetMinutes: finite,
    assumption: v.string(),
    reference: v.string(),
    /**
     * A complete bundle fitted directly to departure delays (its 'arrival' quantity is the
     * departure delay), when the fit data had them (issue 7). Checked by validateBundle.
     */
    fitted: v.optional(v.unknown()),
  }),
  draws: v.strictObject({
    count: v.pipe(v.number(), v.integer(), v.minValue(1), v.maxValue(100_000)),
    seed: v.pipe(v.number(), v.integer()),
  }),
});
export type PosteriorBundle = v.InferOutput<typeof BundleSchema>;

/** A bundle that failed to parse or check. The message says what is wrong and where. */
export class BundleFormatError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'BundleFormatError';
  }
}

function fail(message: string): never {
  throw new BundleFormatError(`not a valid route-posterior bundle: ${message}`);
}

/** The number of Cholesky entries of a k x k lower triangle. */
export function triangleSize(k: number): number {
  return (k * (k + 1)) / 2;
}

/**
 * Checks what the schema cannot: array lengths agree with the model's parameter count,
 * indices are in range, Cholesky diagonals are positive.
 */
function checkConsistency(b: PosteriorBundle): void {
  const k = b.model.parameters.length;
  const expected: Record<string, number> = { gumbel: 2, 'gumbel-gumbel': 5, 'gumbel-t': 5, 'gumbel-lomax': 5, 'gumbel-gumbel-lomax': 8 };
  if (k !== expected[b.model.family]) fail(`model ${b.model.family} has ${expected[b.model.family]} parameters, the file lists ${k}`);
  for (const j of b.model.monthEffects) if (j >= k) fail(`month effect index ${j} is out of range`);
  const m = b.model.monthEffects.length;
  for (const [name, arr] of [
    ['population.mean', b.population.mean],
    ['population.routeSd', b.population.routeSd],
    ['population.originSd', b.population.originSd],
    ['population.destinationSd', b.population.destinationSd],
  ] as const) {
    if (arr.length !== k) fail(`${name} has ${arr.length} entries, expected ${k}`);
  }
  if (b.population.monthLogSd.length !== m) fail(`population.monthLogSd has ${b.population.monthLogSd.length} entries, expected ${m}`);
  if ((b.population.logDf === null) !== (b.model.family !== 'gumbel-t')) fail('population.logDf must be given exactly for the gumbel-t family');
  const na = b.airports.codes.length;
  if (new Set(b.airports.codes).size !== na) fail('airports.codes has duplicates');
  for (const [name, table] of [
    ['airports.originMean', b.airports.originMean],
    ['airports.originSd', b.airports.originSd],
    ['airports.destinationMean', b.airports.destinationMean],
    ['airports.destinationSd', b.airports.destinationSd],
  ] as const) {
    if (table.length !== na) fail(`${name} has ${table.length} rows, expected ${na}`);
    table.forEach((row, i) => row.length !== k && fail(`${name}[${i}] has ${row.length} entries, expected ${k}`));
  }
  if (b.months.effects.length !== b.months.labels.length) fail('months.effects and months.labels differ in length');
  b.months.effects.forEach((row, i) => row.length !== m && fail(`months.effects[${i}] has ${row.length} entries, expected ${m}`));
  const width = 3 + k + triangleSize(k);
  const seen = new Set<number>();
  b.routes.rows.forEach((row, i) => {
    if (row.length !== width) fail(`routes.rows[${i}] has ${row.length} entries, expected ${width}`);
    const [o, d, flights] = row as [number, number, number];
    if (!Number.isInteger(o) || o < 0 || o >= na || !Number.isInteger(d) || d < 0 || d >= na) fail(`routes.rows[${i}] has an airport index out of range`);
    if (!(flights >= 0)) fail(`routes.rows[${i}] has a negative flight count`);
    const key = o * na + d;
    if (seen.has(key)) fail(`routes.rows[${i}] repeats the route ${b.airports.codes[o]}-${b.airports.codes[d]}`);
    seen.add(key);
    for (let j = 0; j < k; j++) {
      const diag = row[3 + k + triangleSize(j + 1) - 1]!;
      if (!(diag > 0)) fail(`routes.rows[${i}] has a Cholesky diagonal that is not positive`);
    }
  });
}

/** Validates a parsed JSON value as a bundle; throws BundleFormatError with a clear message. */
export function validateBundle(value: unknown): PosteriorBundle {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) fail('expected a JSON object');
  const format = (value as { format?: unknown }).format;
  if (format !== BUNDLE_FORMAT) fail(`its format is ${JSON.stringify(format ?? null)}, expected "${BUNDLE_FORMAT}" (is this a Layline bundle?)`);
  const version = (value as { version?: unknown }).version;
  if (version !== BUNDLE_VERSION) fail(`format version ${JSON.stringify(version ?? null)} is not supported; this Layline reads version ${BUNDLE_VERSION}`);
  const result = v.safeParse(BundleSchema, value);
  if (!result.success) {
    const first = result.issues[0];
    const where = first ? v.getDotPath(first) : null;
    fail(`${where ? `at ${where}: ` : ''}${first?.message ?? 'unknown problem'}${result.issues.length > 1 ? ` (and ${result.issues.length - 1} more problems)` : ''}`);
  }
  checkConsistency(result.output);
  const departureFit = result.output.departure.fitted;
  if (departureFit !== undefined) {
    try {
      validateBundle(departureFit);
    } catch (err) {
      fail(`at departure.fitted: ${err instanceof Error ? err.message.replace(/^not a valid route-posterior bundle: /, '') : String(err)}`);
    }
  }
  return result.output;
}
