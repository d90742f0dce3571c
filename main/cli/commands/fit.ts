// `layline fit <csv> --model grouped --method map|advi|fullrank|svi|nuts`: fits a delay model
// to a delimited file and prints each group's posterior location and scale with diagnostics.
//
// Models plug in through cli/fit/fit-models.ts; algorithms through cli/fit/fit-methods.ts.
import { FitAbortedError, FitDivergedError, type FitResult } from '../../../shared/inference/fit-types';
import { createRng } from '../../../shared/inference/rng';
import { parseFlags, type CliCommand } from '../command';
import { CliFailure, UsageError } from '../io';
import { readCsvTable } from '../fit/csv-columns';
import { FIT_METHODS, isFitMethod, methodDiagnostics, runMethod, type MethodOptions } from '../fit/fit-methods';
import { fitModels } from '../fit/fit-models';
import { fitWarnings } from '../fit/fit-warnings';
import { createProgressBar } from '../fit/progress-bar';
import { isRouteHistoryFit, ROUTE_HISTORY_USAGE, runRouteHistoryFit } from '../fit-history/route-history-fit';

const usage = [
  'Usage: layline fit <csv> --model NAME --method METHOD [options]',
  '',
  'Fits a Bayesian delay model to a delimited file (header row; comma, semicolon, tab or pipe)',
  "and prints each group's posterior mean and sd of location and scale, the method, iterations,",
  'elapsed milliseconds and diagnostics. Use - to read standard input.',
  '',
  'Models (--model):',
  ...fitModels.map((m) => `  ${m.name.padEnd(10)} ${m.summary}`),
  '',
  `Methods (--method): ${FIT_METHODS.join(', ')}`,
  '  map       maximum a posteriori (L-BFGS), sds from the Laplace approximation',
  '  advi      mean-field ADVI;  fullrank: full-rank ADVI;  svi: minibatch stochastic VI',
  '  nuts      the No-U-Turn Sampler (reference quality, slower)',
  '',
  'Options:',
  ...fitModels.flatMap((m) => m.flagUsage),
  '  --seed N              random seed (default 1); the same seed gives the same result',
  '  --max-iterations N    iteration cap (NUTS: warm-up plus draws per chain)',
  '  --chains N            NUTS chains (default 4)',
  '  --warmup N            NUTS warm-up iterations per chain (default 1000)',
  '  --draws N             NUTS kept draws per chain (default 1000)',
  '  --json                print one JSON object instead of the table',
  '',
  'Estimates from historical data, not guarantees; airline rules and local regulations decide.',
  '',
  ROUTE_HISTORY_USAGE,
].join('\n');

function wholeNumber(flag: string, text: string | undefined, min: number): number | undefined {
  if (text === undefined) return undefined;
  const n = /^[+-]?\d+$/.test(text.trim()) ? Number(text) : NaN;
  if (!Number.isSafeInteger(n) || n < min) throw new UsageError(`fit: ${flag} needs a whole number >= ${min}, got '${text}'`);
  return n;
}

function formatValue(v: number | string | boolean): string {
  if (typeof v !== 'number') return String(v);
  return Number.isInteger(v) ? String(v) : v.toPrecision(4);
}

export const fitCommand: CliCommand = {
  name: 'fit',
  summary: 'Fit a Bayesian delay model to a CSV file (MAP, ADVI, SVI or NUTS)',
  usage,
  run: async (argv, io) => {
    // --model route (a delay-history file, several fits, a saved bundle) has its own path.
    if (isRouteHistoryFit(argv)) return runRouteHistoryFit(argv, io);
    const modelFlags = Object.assign({}, ...fitModels.map((m) => m.flags)) as Record<string, { type: 'string' }>;
    const { values, positionals } = parseFlags(
      argv,
      {
        ...modelFlags,
        model: { type: 'string' },
        method: { type: 'string' },
        seed: { type: 'string' },
        'max-iterations': { type: 'string' },
        chains: { type: 'string' },
        warmup: { type: 'string' },
        draws: { type: 'string' },
        json: { type: 'boolean' },
      },
      'fit',
    );
    if (positionals.length !== 1) throw new UsageError(`fit: expected one input file, got ${positionals.length === 0 ? 'none' : positionals.join(' ')}`);
    const file = positionals[0]!;
    const modelName = values.model as string | undefined;
    const adapter = fitModels.find((m) => m.name === modelName);
    if (!adapter) {
      throw new UsageError(`fit: ${modelName === undefined ? '--model is required' : `unknown model '${modelName}'`}; models: ${fitModels.map((m) => m.name).join(', ')}`);
    }
    const method = values.method as string | undefined;
    if (method === undefined || !isFitMethod(method)) {
      throw new UsageError(`fit: ${method === undefined ? '--method is required' : `unknown method '${method}'`}; methods: ${FIT_METHODS.join(', ')}`);
    }
    const seed = wholeNumber('--seed', values.seed as string | undefined, 0) ?? 1;
    const options: MethodOptions = {
      rng: createRng(seed),
      maxIterations: wholeNumber('--max-iterations', values['max-iterations'] as string | undefined, 1),
      chains: wholeNumber('--chains', values.chains as string | undefined, 1),
      warmup: wholeNumber('--warmup', values.warmup as string | undefined, 0),
      draws: wholeNumber('--draws', values.draws as string | undefined, 2),
    };

    const source = file === '-' ? 'standard input' : file;
    const prepared = await adapter.prepare({ path: file, source, io, readTable: async () => readCsvTable(await io.readInput(file), source) }, values);

    const bar = createProgressBar(io, `fit ${method}`);
    let result: FitResult;
    try {
      result = await runMethod(method, prepared.model, { ...options, onProgress: (p) => bar.update(p) }, prepared.nutsCentredBlocks);
    } catch (err) {
      if (err instanceof FitDivergedError || err instanceof FitAbortedError) throw new CliFailure(err.message);
      if (err instanceof RangeError) throw new CliFailure(`${method}: ${err.message}`);
      throw err;
    } finally {
      bar.done();
    }
    const summaryRng = createRng(seed).split();
    const fitDiagnostics = methodDiagnostics(prepared.model, result, summaryRng);
    const summary = prepared.summarise(result, summaryRng);
    const warnings = fitWarnings(method, result.converged, fitDiagnostics);
    const diagnostics = {
      ...fitDiagnostics,
      converged: result.converged,
      observations: prepared.observations,
      model: adapter.name,
      ...prepared.modelDiagnostics,
      ...summary.diagnostics,
      seed,
      ...(warnings.length > 0 ? { warnings: warnings.join('; ') } : {}),
    };
    const elapsedMs = Math.round(result.elapsedMs);

    if (values.json) {
      io.stdout(JSON.stringify({ method, elapsedMs, iterations: result.iterations, diagnostics, ...summary.json }, null, 2) + '\n');
      return 0;
    }
    const lines = [
      `${adapter.name} model, ${method}: ${prepared.observations} observations, ${result.iterations} iterations, ${elapsedMs} ms${result.converged ? '' : ' (did not meet its convergence rule)'}`,
      '',
      summary.text.trimEnd(),
      '',
      'diagnostics:',
      ...Object.entries(diagnostics)
        .filter(([k]) => k !== 'warnings')
        .map(([k, v]) => `  ${k}: ${formatValue(v)}`),
      '',
      ...warnings.map((w) => `warning: ${w}`),
      ...(warnings.length > 0 ? [''] : []),
      'Posterior means ± sd. Estimates from historical data, not guarantees; airline rules and local regulations decide.',
    ];
    io.stdout(lines.join('\n') + '\n');
    return 0;
  },
};
