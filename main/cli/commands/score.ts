// `layline score <file|->`: scores every connection and trip against the delay posteriors and
// prints a terminal table, JSON (the `layline parse` shape, extended) or CSV.
//
// File reading lives here; parsing of trips, MCT files and bundles, and all scoring, is in shared/.
import path from 'node:path';
import type { PosteriorSource } from '../../../shared/delay/predictive';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import { findAirport } from '../../../shared/time/airports';
import { parseMctRules } from '../../../shared/risk/mct-file';
import { formatScoreCsv, formatScoreTable } from '../../../shared/risk/score-format';
import { DEFAULT_REBOOK_GAP_MINUTES, DEFAULT_SEED, DEFAULT_SIMULATIONS, DEFAULT_TARGET, resolveScoreSettings, scoreTrips } from '../../../shared/risk/score-trips';
import { DEFAULT_TRANSFER_MINUTES } from '../../../shared/risk/mct';
import { RISK_CAUTION, type MctRule, type ScoredTrips, type ScoreOptions } from '../../../shared/risk/types';
import { parseFlags, type CliCommand } from '../command';
import { CliFailure, UsageError, type CliIo } from '../io';
import { parseOutput } from './parse';
import { loadPosteriorSource } from './score-source';

/** The scoring options, shared with every command that scores (e.g. `layline report`). */
export const SCORING_FLAGS_USAGE = `  --target P            target probability of making a connection (default ${DEFAULT_TARGET})
  --interval P          credible level of the intervals (default 0.9: 5%-95%)
  --bundle FILE         posterior bundle (JSON) to use instead of the bundled one
  --mct FILE            MCT overrides, CSV or JSON: airport, type, minutes[, departAirport];
                        type is domestic, international, international-arrival,
                        international-departure or transfer (ground transfer on an airport change)
  --transfer MIN        default ground-transfer allowance on an airport change (default ${DEFAULT_TRANSFER_MINUTES})
  --rebook-gap MIN      minutes to the next departure after a missed connection (default ${DEFAULT_REBOOK_GAP_MINUTES})
  --rebook-gap-trip ID=MIN
                        the same for one trip (its id from 'layline parse'); repeatable
  --seed N              seed of the simulation (default ${DEFAULT_SEED}); the same seed gives the same output
  --simulations N       simulations for trip delays and the group (default ${DEFAULT_SIMULATIONS})
`;

export const SCORING_FLAGS = {
  target: { type: 'string' },
  interval: { type: 'string' },
  bundle: { type: 'string' },
  mct: { type: 'string' },
  transfer: { type: 'string' },
  'rebook-gap': { type: 'string' },
  'rebook-gap-trip': { type: 'string', multiple: true },
  seed: { type: 'string' },
  simulations: { type: 'string' },
} as const;

/** The values parseFlags gives for SCORING_FLAGS. */
export interface ScoringFlagValues {
  readonly target?: string;
  readonly interval?: string;
  readonly bundle?: string;
  readonly mct?: string;
  readonly transfer?: string;
  readonly 'rebook-gap'?: string;
  readonly 'rebook-gap-trip'?: readonly string[];
  readonly seed?: string;
  readonly simulations?: string;
}

const USAGE = `Usage: layline score <file|-> [options]

Scores every connection of the planned trips in <file> ('-' reads standard input; the same
formats as 'layline parse'): the probability of making it, its credible interval, the smallest
layover that reaches the target, whole-trip numbers, the ranking of alternative options, and
the group's expected number of misconnecting travellers.

Options:
${SCORING_FLAGS_USAGE}  --format F            table (default), json or csv

Default MCTs (common practice, no source): 45 min domestic, 60 international, 90 arriving
from abroad. Real MCTs are set per airport (IATA Resolution 765); pass them with --mct.

Exit code: 0 when trips were scored, 1 when no leg could be read or a file is bad, 2 for usage errors.
${RISK_CAUTION}
`;

function numberFlag(value: string | undefined, name: string, check: (n: number) => boolean, what: string, command = 'score'): number | undefined {
  if (value === undefined) return undefined;
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n) || !check(n)) throw new UsageError(`${command}: --${name} must be ${what}, got '${value}'`);
  return n;
}

const wholeMinutes = (n: number) => Number.isInteger(n) && n >= 1 && n <= 2880;

function rebookGapsByTrip(values: readonly string[] | undefined, command = 'score'): Record<string, number> {
  const out: Record<string, number> = {};
  for (const v of values ?? []) {
    const eq = v.lastIndexOf('=');
    const id = eq > 0 ? v.slice(0, eq) : '';
    const gap = numberFlag(eq > 0 ? v.slice(eq + 1) : '', 'rebook-gap-trip', wholeMinutes, 'TRIP_ID=MINUTES with whole minutes from 1 to 2880', command);
    if (!id || gap === undefined) throw new UsageError(`${command}: --rebook-gap-trip must be TRIP_ID=MINUTES, got '${v}'`);
    out[id] = gap;
  }
  return out;
}

async function readMctRules(file: string, io: CliIo): Promise<MctRule[]> {
  const parsed = parseMctRules(await io.readInput(file));
  const errors = parsed.problems.filter((p) => p.severity === 'error');
  for (const p of parsed.problems.filter((x) => x.severity === 'warning')) io.stderr(`layline: ${file}: ${p.message}\n`);
  if (errors.length) throw new CliFailure(`bad MCT file ${file}:\n${errors.map((p) => `  ${p.line ? `line ${p.line}: ` : ''}${p.message}`).join('\n')}`);
  return [...parsed.rules];
}

/** The JSON: `layline parse`'s trips and problems, each connection and trip extended with its scores. */
export function scoreJson(scored: ScoredTrips) {
  const parsedShape = parseOutput({ format: scored.format, trips: scored.trips.map((t) => ({ ...t, connections: [] })), problems: scored.problems });
  return {
    trips: scored.trips.map((t, k) => {
      return {
        ...parsedShape.trips[k],
        deadlineLocal: t.deadlineLocal,
        deadlineUtc: t.deadlineUtc,
        connections: t.connections.map((c) => ({
          airport: c.airport,
          layoverMinutes: c.layoverMinutes,
          flags: [...c.flags],
          departAirport: c.departAirport,
          inboundFlight: c.inboundFlight,
          outboundFlight: c.outboundFlight,
          connectionType: c.connectionType,
          mctMinutes: c.mctMinutes,
          mctSource: c.mctSource,
          transferMinutes: c.transferMinutes,
          scored: c.scored,
          pMake: c.pMake,
          pMakeInterval: c.pMakeInterval,
          minLayoverMinutes: c.minLayoverMinutes,
          marginMinutes: c.marginMinutes,
          warnings: c.warnings,
          inbound: c.inbound,
          outbound: c.outbound,
        })),
        rebookGapMinutes: t.rebookGapMinutes,
        pAllConnections: t.pAllConnections,
        pAllConnectionsInterval: t.pAllConnectionsInterval,
        expectedArrivalDelayMinutes: t.expectedArrivalDelayMinutes,
        arrivalDelayQuantilesMinutes: t.arrivalDelayQuantilesMinutes,
        pArriveByDeadline: t.pArriveByDeadline,
        pOnTime: t.pOnTime,
        onTimeBasis: t.onTimeBasis,
        travelMinutes: t.travelMinutes,
        optionGroup: t.optionGroup,
        optionRank: t.optionRank,
        optionCount: t.optionCount,
        paretoOptimal: t.paretoOptimal,
      };
    }),
    problems: parsedShape.problems,
    target: scored.target,
    intervalLevel: scored.intervalLevel,
    seed: scored.seed,
    simulations: scored.simulations,
    bundle: scored.bundle,
    mct: scored.mct,
    group: scored.group,
    caution: scored.caution,
  };
}

type SourceLoader = (bundlePath: string | undefined, io: CliIo) => Promise<PosteriorSource>;

/**
 * Reads the trips at `input` and scores them with the scoring flags: what `layline score` and
 * `layline report` share, so the same flags give the same numbers. Usage errors name `command`.
 */
export async function scoreInputWithFlags(command: string, input: string, values: ScoringFlagValues, io: CliIo, loadSource: SourceLoader = loadPosteriorSource): Promise<ScoredTrips> {
  const probability = (n: number) => n > 0 && n < 1;
  const options: ScoreOptions = {
    countryOf: (code) => findAirport(code)?.country,
    target: numberFlag(values.target, 'target', probability, 'a probability strictly between 0 and 1', command),
    intervalLevel: numberFlag(values.interval, 'interval', probability, 'a probability strictly between 0 and 1', command),
    transferMinutes: numberFlag(values.transfer, 'transfer', (n) => Number.isInteger(n) && n >= 0 && n <= 1440, 'whole minutes from 0 to 1440', command),
    rebookGapMinutes: numberFlag(values['rebook-gap'], 'rebook-gap', wholeMinutes, 'whole minutes from 1 to 2880', command),
    rebookGapByTrip: rebookGapsByTrip(values['rebook-gap-trip'], command),
    seed: numberFlag(values.seed, 'seed', (n) => Number.isInteger(n) && n >= 0 && n <= 0xffffffff, 'a whole number from 0 to 4294967295', command),
    simulations: numberFlag(values.simulations, 'simulations', (n) => Number.isInteger(n) && n >= 100 && n <= 1_000_000, 'a whole number from 100 to 1000000', command),
  };
  resolveScoreSettings(options);
  const text = await io.readInput(input);
  const mctRules = values.mct ? await readMctRules(values.mct, io) : [];
  const parsed = parseTrips(text, input === '-' ? {} : { fileName: path.basename(input) });
  const legs = parsed.trips.reduce((n, t) => n + t.legs.length, 0);
  if (legs === 0) {
    for (const p of parsed.problems) io.stderr(`layline: line ${p.line}: ${p.message}\n`);
    throw new CliFailure(`no flight legs could be read from ${input === '-' ? 'standard input' : input}`);
  }
  const unknownTrips = Object.keys(options.rebookGapByTrip ?? {}).filter((id) => !parsed.trips.some((t) => t.id === id));
  if (unknownTrips.length) throw new UsageError(`${command}: --rebook-gap-trip names no trip in the input: ${unknownTrips.join(', ')} (trip ids: ${parsed.trips.map((t) => t.id).join(', ')})`);
  const source = await loadSource(values.bundle, io);
  try {
    return scoreTrips(parsed, source, { ...options, mctRules });
  } catch (err) {
    throw new CliFailure(err instanceof Error ? err.message : String(err));
  }
}

export function createScoreCommand(loadSource: SourceLoader = loadPosteriorSource): CliCommand {
  return {
    name: 'score',
    summary: 'Score connections and trips: P(make) with intervals, minimum layovers, options, group',
    usage: USAGE,
    run: async (argv, io) => {
      const { values, positionals } = parseFlags(argv, { ...SCORING_FLAGS, format: { type: 'string' } }, 'score');
      if (positionals.length !== 1) throw new UsageError(positionals.length === 0 ? 'score: give a file, or - for standard input' : `score: one input at a time, got ${positionals.length}`);
      const format = values.format ?? 'table';
      if (format !== 'table' && format !== 'json' && format !== 'csv') throw new UsageError(`score: --format must be table, json or csv, got '${format}'`);
      const scored = await scoreInputWithFlags('score', positionals[0] ?? '-', values, io, loadSource);
      if (format === 'json') io.stdout(JSON.stringify(scoreJson(scored), null, 2) + '\n');
      else if (format === 'csv') io.stdout(formatScoreCsv(scored));
      else io.stdout(formatScoreTable(scored));
      const errors = scored.problems.filter((p) => p.severity === 'error').length;
      const connections = scored.trips.reduce((n, t) => n + t.connections.filter((c) => c.scored).length, 0);
      io.stderr(
        `scored ${connections} connection${connections === 1 ? '' : 's'} in ${scored.trips.length} trip${scored.trips.length === 1 ? '' : 's'}; ${errors} input error${errors === 1 ? '' : 's'}, ${scored.problems.length - errors} warning${scored.problems.length - errors === 1 ? '' : 's'}${format === 'table' ? '' : `\n${RISK_CAUTION}`}\n`,
      );
      return 0;
    },
  };
}

export const scoreCommand: CliCommand = createScoreCommand();
