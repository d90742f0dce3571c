// `layline fit <history.csv|.parquet> --model route ...`: imports a delay history, fits route
// posteriors (held-out month scored, then refitted on everything) and saves a bundle.
//
// Reached from the `fit` command when --model is route. The bundle is written atomically and
// only after everything succeeded: a failure or Ctrl-C leaves an existing --out file untouched.
import { access, constants, readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import { validateBundle, type PosteriorBundle } from '../../../shared/delay/bundle/bundle-schema';
import { createBundleSource } from '../../../shared/delay/bundle/posterior-source';
import { HISTORY_FIELDS, type ColumnOverrides, type HistoryField } from '../../../shared/history/columns';
import { candidateFromBundle, fitRouteHistory, HISTORY_FIT_METHODS, type HistoryFitMethod, type KindEvaluation } from '../../../shared/history/history-fit';
import { defaultBundle } from '../../../shared/history/default-candidate';
import { summariseHistoryFit } from '../../../shared/history/history-fit-summary';
import { HoldoutError, parseHoldoutAfter } from '../../../shared/history/holdout';
import { FitAbortedError, FitDivergedError } from '../../../shared/inference/fit-types';
import { readHistoryFile } from '../../history/read-history-file';
import { HistoryFileError } from '../../../shared/history/history-file-error';
import { writeFileAtomic } from '../../workspace/atomic-write';
import { parseFlags } from '../command';
import { CliFailure, UsageError, type CliIo } from '../io';
import { createEtaProgress } from './eta-progress';

export const ROUTE_HISTORY_USAGE = [
  'Usage: layline fit <history.csv|history.parquet> --model route --out bundle.json [options]',
  '',
  "Fits route posteriors to your own delay history. The last month of data is held out and scored",
  '(log score, tail calibration, QQ); then the model is refitted on all flights and saved as a bundle.',
  'Column names of the U.S. BTS on-time performance download are recognised automatically.',
  'Departure delays, when present, are fitted directly. Cancelled and diverted flights are counted',
  'apart and never treated as on time.',
  '',
  'Options:',
  '  --out FILE             where to save the bundle (required; written only when the fit succeeds)',
  `  --method METHOD        ${HISTORY_FIT_METHODS.join(', ')} (default map)`,
  '  --holdout-after DATE   hold out flights after DATE (YYYY-MM-DD); default: the last month',
  '  --column FIELD=NAME    use column NAME for FIELD (repeatable), or FIELD= for none;',
  `                         fields: ${HISTORY_FIELDS.join(', ')}`,
  '  --like BUNDLE          fit the model of this bundle (default: the model of the default bundle)',
  '  --baseline BUNDLE      also score the held-out month under this bundle, for comparison',
  '  --seed N               random seed (default 1)',
  '  --max-iterations N     iteration cap per fit',
  '  --json                 print a JSON summary instead of the tables',
  '',
  'Estimates from historical data, not guarantees; airline rules and local regulations decide.',
].join('\n');

/** True when the fit command's arguments ask for the route-history fit. */
export function isRouteHistoryFit(argv: readonly string[]): boolean {
  const i = argv.indexOf('--model');
  return (i >= 0 && argv[i + 1] === 'route') || argv.includes('--model=route');
}

export interface RouteHistoryFitDeps {
  /** Cancels the run; by default Ctrl-C (SIGINT) does. */
  readonly signal?: AbortSignal;
  /** The bundle whose model choice is refitted when --like is absent. */
  readonly defaultBundle?: () => Promise<PosteriorBundle | null>;
  readonly now?: () => Date;
}

function parseColumns(values: readonly string[]): ColumnOverrides {
  const overrides: ColumnOverrides = {};
  for (const v of values) {
    const eq = v.indexOf('=');
    const field = (eq < 0 ? v : v.slice(0, eq)) as HistoryField;
    if (eq < 0 || !(HISTORY_FIELDS as readonly string[]).includes(field)) {
      throw new UsageError(`fit: --column needs FIELD=NAME with FIELD one of ${HISTORY_FIELDS.join(', ')}, got '${v}'`);
    }
    const name = v.slice(eq + 1);
    overrides[field] = name === '' ? null : name;
  }
  return overrides;
}

function wholeNumber(flag: string, text: string | undefined, min: number): number | undefined {
  if (text === undefined) return undefined;
  const n = /^\d+$/.test(text.trim()) ? Number(text) : NaN;
  if (!Number.isSafeInteger(n) || n < min) throw new UsageError(`fit: ${flag} needs a whole number >= ${min}, got '${text}'`);
  return n;
}

async function readBundleFile(file: string, flag: string): Promise<PosteriorBundle> {
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (err) {
    throw new CliFailure(`${flag}: cannot read ${file}: ${(err as Error).message}`);
  }
  try {
    return validateBundle(JSON.parse(text));
  } catch (err) {
    throw new CliFailure(`${flag}: ${file}: ${(err as Error).message}`);
  }
}

async function checkWritableTarget(out: string): Promise<void> {
  const folder = path.dirname(out);
  try {
    if (!(await stat(folder)).isDirectory()) throw new Error('not a folder');
    await access(folder, constants.W_OK);
  } catch {
    throw new CliFailure(`--out: cannot write into ${folder}: it does not exist or is not writable`);
  }
  try {
    if ((await stat(out)).isDirectory()) throw new CliFailure(`--out: ${out} is a folder`);
  } catch (err) {
    if (err instanceof CliFailure) throw err;
  }
}

function percent(p: number): string {
  return `${(100 * p).toFixed(p < 0.01 ? 2 : 1)}%`;
}

function calibrationLines(e: KindEvaluation): string[] {
  const lines = [
    `  held-out log score: ${e.natsPerFlight.toFixed(4)} nats per flight over ${e.flights} flights` + (e.baseline ? ` (${e.baseline.name}: ${e.baseline.natsPerFlight.toFixed(4)})` : ''),
    '  P(delay > t)   observed   predicted   90% interval        rel. error',
  ];
  for (const r of e.pooled) {
    lines.push(
      `  ${`${r.minutes} min`.padEnd(13)}  ${percent(r.observed).padStart(8)}   ${percent(r.predicted).padStart(9)}   ${`${percent(r.interval[0])} - ${percent(r.interval[1])}`.padEnd(18)}  ${r.relativeError === null ? 'n/a' : `${(100 * r.relativeError).toFixed(1)}%`}`,
    );
  }
  if (e.busiestRoutes.length > 0) {
    lines.push(`  busiest routes, P(delay > 60 min) observed / predicted:`);
    for (const r of e.busiestRoutes) {
      const row = r.rows.find((x) => x.minutes === 60);
      if (row) lines.push(`    ${`${r.origin}-${r.destination}`.padEnd(8)} ${String(r.flights).padStart(7)} flights  ${percent(row.observed).padStart(7)} / ${percent(row.predicted)}`);
    }
  }
  lines.push('  QQ (probability: held-out minutes vs predicted minutes): ' + e.qq.map((q) => `${q.probability}: ${q.observedMinutes} vs ${q.predictedMinutes.toFixed(1)}`).join(', '));
  return lines;
}

export async function runRouteHistoryFit(argv: string[], io: CliIo, deps: RouteHistoryFitDeps = {}): Promise<number> {
  const { values, positionals } = parseFlags(
    argv,
    {
      model: { type: 'string' },
      method: { type: 'string' },
      out: { type: 'string' },
      'holdout-after': { type: 'string' },
      column: { type: 'string', multiple: true },
      like: { type: 'string' },
      baseline: { type: 'string' },
      seed: { type: 'string' },
      'max-iterations': { type: 'string' },
      json: { type: 'boolean' },
    },
    'fit',
  );
  if (values.model !== 'route') throw new UsageError(`fit: this path fits --model route, got '${values.model}'`);
  if (positionals.length !== 1) throw new UsageError(`fit: expected one history file, got ${positionals.length === 0 ? 'none' : positionals.join(' ')}`);
  if (positionals[0] === '-') throw new UsageError('fit: --model route reads a file (CSV or Parquet), not standard input');
  const method = (values.method ?? 'map') as HistoryFitMethod;
  if (!(HISTORY_FIT_METHODS as readonly string[]).includes(method)) throw new UsageError(`fit: --model route takes --method ${HISTORY_FIT_METHODS.join(', ')}, got '${method}'`);
  if (values.out === undefined) throw new UsageError('fit: --out FILE is required with --model route (where to save the bundle)');
  let cutoffDay: number | undefined;
  try {
    cutoffDay = values['holdout-after'] === undefined ? undefined : parseHoldoutAfter(values['holdout-after']);
  } catch (err) {
    throw new UsageError(`fit: ${(err as Error).message}`);
  }
  const overrides = parseColumns(values.column ?? []);
  const seed = wholeNumber('--seed', values.seed, 0) ?? 1;
  const maxIterations = wholeNumber('--max-iterations', values['max-iterations'], 1);
  const input = path.resolve(io.cwd, positionals[0]!);
  const out = path.resolve(io.cwd, values.out);
  await checkWritableTarget(out);

  const loadDefault = deps.defaultBundle ?? (async () => defaultBundle());
  const like = values.like !== undefined ? await readBundleFile(path.resolve(io.cwd, values.like), '--like') : await loadDefault();
  if (!like) throw new CliFailure('fit: no default bundle is available to take the model from; name one with --like BUNDLE');
  const candidate = candidateFromBundle(like);
  const baselineBundle = values.baseline !== undefined ? await readBundleFile(path.resolve(io.cwd, values.baseline), '--baseline') : null;

  const controller = new AbortController();
  const onSigint = () => controller.abort();
  const external = deps.signal;
  if (external) external.addEventListener('abort', onSigint, { once: true });
  else process.once('SIGINT', onSigint);
  const progress = createEtaProgress(io);
  const READ_SHARE = 0.2;
  try {
    const read = await readHistoryFile(input, {
      overrides,
      signal: controller.signal,
      onProgress: (p) => progress.update(READ_SHARE * p.fraction, `reading ${path.basename(input)}: ${p.rows} rows`),
    });
    const now = (deps.now ?? (() => new Date()))();
    const result = await fitRouteHistory(read.table, {
      method,
      seed,
      candidate,
      cutoffDay,
      maxIterations,
      signal: controller.signal,
      onProgress: (p) => progress.update(READ_SHARE + (1 - READ_SHARE) * p.fraction, p.label),
      baseline: baselineBundle ? { name: baselineBundle.id, source: createBundleSource(baselineBundle, { drawCount: 100, isKnownAirport: () => true }) } : undefined,
      metadata: {
        id: `history-${path.basename(input).replace(/[^A-Za-z0-9._-]/g, '_')}-${now.toISOString().replace(/[-:]/g, '').slice(0, 15)}`,
        title: `Route posteriors fitted to ${path.basename(input)}`,
        source: `${path.basename(input)}: a delay history imported by the user (${read.table.summary.rows} rows)`,
        license: "the user's own data",
        createdAt: now.toISOString(),
      },
    });
    if (controller.signal.aborted) throw new FitAbortedError(method, 0);
    const text = JSON.stringify(result.bundle);
    // Refuse to save what the loader would refuse to read.
    validateBundle(JSON.parse(text));
    await writeFileAtomic(out, text);
    progress.update(1, `saved ${path.basename(out)}`);
    progress.done();
    if (values.json) {
      io.stdout(JSON.stringify({ input, format: read.format, out, ...summariseHistoryFit(result, candidate, text.length) }, null, 2) + '\n');
      return 0;
    }
    const s = result.summary;
    const lines = [
      `Imported ${s.rows} rows from ${path.basename(input)} (${read.format}): ${s.flights} flights, ${s.cancelled} cancelled, ${s.diverted} diverted, ${s.invalid} invalid; ${s.routes} routes, ${s.firstDate} to ${s.lastDate}.`,
      ...s.invalidByReason.map((r) => `  invalid, ${r.label}: ${r.count} (e.g. row ${r.samples.map((x) => x.row).join(', ')})`),
      `Held out ${result.holdout.heldOutFlights} flights after ${result.holdout.holdoutAfter}; fitted ${candidate.name} by ${method}.`,
      '',
      'Arrival delays:',
      ...calibrationLines(result.arrival),
      ...(result.departure ? ['', 'Departure delays (fitted directly):', ...calibrationLines(result.departure)] : ['', 'No departure delays in the file: departures stay derived from arrivals.']),
      '',
      `Saved ${out} (${(text.length / 1e6).toFixed(2)} MB), refitted on all ${result.bundle.metadata.flights} flights in ${(result.elapsedMs / 1000).toFixed(1)} s.`,
      'These are estimates from historical data, not guarantees; airline rules and local regulations decide.',
    ];
    io.stdout(lines.join('\n') + '\n');
    return 0;
  } catch (err) {
    progress.done();
    if (err instanceof FitAbortedError || controller.signal.aborted) throw new CliFailure(`fit cancelled; ${path.basename(out)} was not written or changed`, 130);
    if (err instanceof HistoryFileError || err instanceof HoldoutError) throw new CliFailure(`${err.message}; nothing was written`);
    if (err instanceof FitDivergedError) throw new CliFailure(`${err.message}; nothing was written`);
    throw err;
  } finally {
    if (external) external.removeEventListener('abort', onSigint);
    else process.off('SIGINT', onSigint);
  }
}
