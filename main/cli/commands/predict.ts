// `layline predict`: posterior predictive exceedance probabilities for one route's delays.
import { BundleFormatError } from '../../../shared/delay/bundle/bundle-schema';
import { loadDefaultPosteriorSource } from '../../../shared/delay/bundle/default-bundle';
import { exceedance } from '../../../shared/delay/bundle/exceedance';
import { parsePosteriorBundle, type BundlePosteriorSource } from '../../../shared/delay/bundle/posterior-source';
import type { DelayKind, RoutePosterior } from '../../../shared/delay/predictive';
import { parseFlags, type CliCommand } from '../command';
import { CliFailure, UsageError, type CliIo } from '../io';

const USAGE = `Usage: layline predict --route ORIGIN-DESTINATION [--over 15,30,60,120] [--kind arrival|departure] [--bundle FILE] [--json]

Prints the posterior predictive probability that a flight's delay exceeds each threshold,
with a 90% credible interval over parameter uncertainty.

Options:
  --route ORD-ATL      IATA codes of origin and destination
  --over LIST          thresholds in minutes, comma-separated (default 15,30,60,120,180)
  --kind KIND          arrival (default) or departure; departures are derived from arrivals
  --bundle FILE        a route-posterior bundle to use instead of the bundled one
  --json               print JSON: { route, kind, pooled, flights, pooling, derived, exceedance: [{ minutes, p, interval }] }

A route absent from the fit data gets the pooled predictive of its airports (pooled: true);
an airport absent from the data gets the population predictive. An unknown code is an error.
Estimates from historical delay data, not guarantees.
`;

function parseRoute(text: string | undefined): [string, string] {
  if (text === undefined) throw new UsageError('predict: --route ORIGIN-DESTINATION is required, e.g. --route ORD-ATL');
  const m = /^\s*([A-Za-z0-9]{3})\s*-\s*([A-Za-z0-9]{3})\s*$/.exec(text);
  if (!m) throw new UsageError(`predict: --route must be two IATA codes joined by '-', e.g. ORD-ATL; got '${text}'`);
  return [m[1]!.toUpperCase(), m[2]!.toUpperCase()];
}

function parseThresholds(text: string | undefined): number[] {
  if (text === undefined) return [15, 30, 60, 120, 180];
  const parts = text.split(',').map((s) => s.trim());
  const values = parts.map(Number);
  const bad = parts.filter((p, i) => p === '' || !Number.isFinite(values[i]!));
  if (bad.length) throw new UsageError(`predict: --over needs numbers of minutes separated by commas; could not read '${bad.join("', '")}'`);
  return values;
}

function parseKind(text: string | undefined): DelayKind {
  if (text === undefined || text === 'arrival') return 'arrival';
  if (text === 'departure') return 'departure';
  throw new UsageError(`predict: --kind must be arrival or departure, got '${text}'`);
}

async function sourceFor(bundlePath: string | undefined, io: CliIo): Promise<BundlePosteriorSource> {
  if (bundlePath === undefined) return loadDefaultPosteriorSource();
  const text = await io.readInput(bundlePath);
  try {
    return parsePosteriorBundle(text);
  } catch (err) {
    if (err instanceof BundleFormatError) throw new CliFailure(`${bundlePath}: ${err.message}`);
    throw err;
  }
}

function percent(p: number): string {
  return `${(100 * p).toFixed(p < 0.01 ? 2 : 1)}%`;
}

function describePooling(post: RoutePosterior): string {
  if (post.pooling === 'route') return `fitted on ${post.flights.toLocaleString('en-US')} flights of this route`;
  if (post.pooling === 'airports') return 'route not in the data: pooled from its origin and destination airports';
  return 'an airport not in the data: population-level predictive only';
}

export const predictCommand: CliCommand = {
  name: 'predict',
  summary: 'Probability that a route\'s delay exceeds given minutes, with credible intervals',
  usage: USAGE,
  run: async (argv, io) => {
    const { values, positionals } = parseFlags(
      argv,
      { route: { type: 'string' }, over: { type: 'string' }, kind: { type: 'string' }, bundle: { type: 'string' }, json: { type: 'boolean' } },
      'predict',
    );
    if (positionals.length) throw new UsageError(`predict: unexpected argument '${positionals[0]}'`);
    const [origin, destination] = parseRoute(values.route);
    const minutes = parseThresholds(values.over);
    const kind = parseKind(values.kind);
    const source = await sourceFor(values.bundle, io);
    let post: RoutePosterior;
    try {
      post = source.route(origin, destination, kind);
    } catch (err) {
      throw new CliFailure(`predict: ${err instanceof Error ? err.message : String(err)}`);
    }
    const rows = exceedance(post, minutes);
    const route = `${post.origin}-${post.destination}`;
    if (values.json) {
      const out = {
        route,
        kind,
        pooled: post.pooling !== 'route',
        flights: post.flights,
        pooling: post.pooling,
        derived: post.derived,
        exceedance: rows.map((r) => ({ minutes: r.minutes, p: r.p, interval: [r.interval[0], r.interval[1]] })),
      };
      io.stdout(JSON.stringify(out, null, 2) + '\n');
      return 0;
    }
    const lines = [`${route} ${kind} delay (${source.info.id}): ${describePooling(post)}.`];
    if (post.derived) lines.push(`Derived, not fitted: ${source.bundle.departure.assumption}`);
    lines.push('', '  delay over   P(exceeds)   90% credible interval');
    for (const r of rows) lines.push(`  ${`${r.minutes} min`.padStart(10)}   ${percent(r.p).padStart(10)}   ${percent(r.interval[0])} to ${percent(r.interval[1])}`);
    lines.push('', `Estimates from historical delay data (${source.info.source}), not guarantees; airline rules and local regulations decide.`);
    io.stdout(lines.join('\n') + '\n');
    return 0;
  },
};
