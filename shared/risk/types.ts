// The scored-output shapes of the risk engine: connections, trips, option ranking and the group.
//
// `layline score --format json` prints a ScoredTrips; the app and the report build on the same
// types. Every field that extends the `layline parse` output is additive to shared/itinerary/types.
import type { Connection, ConnectionFlag, ParsedTrips, Problem, Trip } from '../itinerary/types';
import type { DelayKind, PoolingLevel, PosteriorSourceInfo } from '../delay/predictive';

/**
 * What formalities a connection involves, from the countries of the three airports involved
 * (inbound origin, connecting airport, outbound destination):
 * 'domestic' - both legs within one country;
 * 'international' - both legs cross a border and the traveller stays airside (transit);
 * 'international-arrival' - arriving from abroad into a country with entry formalities
 *   (inbound leg international and outbound domestic, or a country without airside transit);
 * 'international-departure' - a domestic inbound leg onto an international outbound leg.
 */
export type ConnectionType = 'domestic' | 'international' | 'international-arrival' | 'international-departure';

/** Flags on a scored connection: the parser's flags plus the risk engine's own. */
export type RiskFlag =
  | ConnectionFlag
  /** P(make) is below the target probability. */
  | 'below-target'
  /** No whole-minute layover up to the search limit reaches the target. */
  | 'target-unreachable'
  /** At least one of the two routes was not in the fit data (pooled estimate). */
  | 'pooled-route';

/** A caution attached to one connection, in plain words for the coordinator. */
export interface RiskWarning {
  /** Stable code: 'separate-tickets', 'airport-change', 'below-mct', 'pooled-route', 'no-country'. */
  readonly code: string;
  readonly message: string;
}

/** How much data stands behind one leg's delay posterior. */
export interface RouteEvidence {
  readonly origin: string;
  readonly destination: string;
  readonly kind: DelayKind;
  readonly pooling: PoolingLevel;
  /** Flights of this route in the fit data (0 when pooled). */
  readonly flights: number;
  readonly derived: boolean;
  /** Posterior draws the engine used for this route. */
  readonly drawsUsed: number;
}

/** Where a connection's MCT came from. */
export type MctSource = 'default' | 'override';

/** A probability with its central credible interval across posterior draws. */
export type ProbabilityInterval = readonly [lo: number, hi: number];

export interface ScoredConnection extends Omit<Connection, 'flags'> {
  readonly inboundFlight: string;
  readonly outboundFlight: string;
  readonly connectionType: ConnectionType;
  /** Minimum connection time used, including any ground-transfer allowance. */
  readonly mctMinutes: number;
  readonly mctSource: MctSource;
  /** Ground-transfer allowance inside mctMinutes (0 unless 'airport-change'). */
  readonly transferMinutes: number;
  /** False for a stopover (gap over 24 h), which is not scored; the numbers below are then null. */
  readonly scored: boolean;
  /** Posterior predictive P(A - D <= layover - MCT). */
  readonly pMake: number | null;
  /** Central credible interval (at ScoredTrips.intervalLevel) of P(make) across posterior draws. */
  readonly pMakeInterval: ProbabilityInterval | null;
  /** Smallest whole-minute layover with P(make) >= target; null if none up to the search limit. */
  readonly minLayoverMinutes: number | null;
  /** layoverMinutes - minLayoverMinutes: negative means the layover is short of the target. */
  readonly marginMinutes: number | null;
  readonly flags: readonly RiskFlag[];
  readonly warnings: readonly RiskWarning[];
  /** Inbound leg's arrival posterior and outbound leg's departure posterior. */
  readonly inbound: RouteEvidence | null;
  readonly outbound: RouteEvidence | null;
}

/** How P(on-time arrival) was defined for a trip. */
export type OnTimeBasis =
  /** Arrives at or before the trip's deadline. */
  | 'deadline'
  /** Arrives less than 15 minutes after the scheduled final arrival (US BTS on-time definition). */
  | 'within-15-minutes';

export interface ScoredTrip extends Omit<Trip, 'connections'> {
  readonly connections: readonly ScoredConnection[];
  readonly rebookGapMinutes: number;
  /** P(every scored connection is made), exact under the engine's model (no Monte Carlo noise). */
  readonly pAllConnections: number;
  readonly pAllConnectionsInterval: ProbabilityInterval;
  /** Monte Carlo mean of (actual - scheduled) arrival at the final destination, rebookings included. */
  readonly expectedArrivalDelayMinutes: number;
  /** Monte Carlo quantiles of the final arrival delay (minutes). */
  readonly arrivalDelayQuantilesMinutes: { readonly p50: number; readonly p90: number };
  /** P(arriving at or before the deadline); null without a deadline. */
  readonly pArriveByDeadline: number | null;
  readonly pOnTime: number;
  readonly onTimeBasis: OnTimeBasis;
  /** Scheduled minutes from the first departure to the last arrival. */
  readonly travelMinutes: number;
  /** Key shared by the alternatives of one traveller's trip: traveller + trip. */
  readonly optionGroup: string;
  /** 1 = best among the alternatives (by pOnTime, then expected delay, then travel time). */
  readonly optionRank: number;
  readonly optionCount: number;
  /** No other option is at least as good on all three criteria and better on one. */
  readonly paretoOptimal: boolean;
}

/** One connection (a pair of flights at an airport) and its share of the group's misconnections. */
export interface TopConnection {
  readonly airport: string;
  readonly inboundFlight: string;
  readonly inboundDate: string;
  readonly outboundFlight: string;
  readonly outboundDate: string;
  /** Group travellers booked on this connection. */
  readonly travelers: number;
  readonly pMiss: number;
  /** Expected number of group travellers who miss this connection: travelers x pMiss. */
  readonly expectedMisses: number;
}

export interface GroupSummary {
  /** Distinct travellers in the group (each counted once, whatever their trips). */
  readonly travelers: number;
  readonly simulations: number;
  /** Which option of each traveller's trip the group counts. */
  readonly optionPolicy: 'best-ranked';
  /** Mean number of travellers who miss at least one connection on any of their trips. */
  readonly expectedMisconnecting: number;
  /** Monte Carlo standard error of expectedMisconnecting. */
  readonly expectedMisconnectingStdError: number;
  /** P(at least k travellers misconnect), keys "1".."5". */
  readonly pAtLeast: Readonly<Record<'1' | '2' | '3' | '4' | '5', number>>;
  /** countDistribution[k] = P(exactly k travellers misconnect), k = 0..travelers; sums to 1. */
  readonly countDistribution: readonly number[];
  /** Connections by expected misses, most first (at most 10). */
  readonly topConnections: readonly TopConnection[];
}

/** The caution printed with every set of scores. */
export const RISK_CAUTION =
  'These are estimates from historical delay data, not guarantees. Airline rules, minimum connection times set by airports and airlines, and local regulations decide.';

export interface ScoredTrips {
  readonly format: ParsedTrips['format'];
  readonly trips: readonly ScoredTrip[];
  /** The parser's problems followed by the scorer's (e.g. an airport with no known country). */
  readonly problems: readonly Problem[];
  readonly target: number;
  /** Credible level of every interval, e.g. 0.9 for a 5%-95% interval. */
  readonly intervalLevel: number;
  readonly seed: number;
  readonly simulations: number;
  readonly bundle: PosteriorSourceInfo;
  readonly mct: { readonly source: 'defaults' | 'defaults+overrides'; readonly overrides: number };
  readonly group: GroupSummary;
  readonly caution: string;
}

/** One point of the P(make)-against-layover curve the UI charts. */
export interface MakeCurvePoint {
  readonly layoverMinutes: number;
  readonly pMake: number;
  readonly lo: number;
  readonly hi: number;
}

export interface MakeCurve {
  readonly mctMinutes: number;
  readonly target: number;
  readonly intervalLevel: number;
  readonly minLayoverMinutes: number | null;
  readonly points: readonly MakeCurvePoint[];
}

/**
 * Predictive distribution of the connection margin layover - MCT - (A - D), in whole minutes:
 * the connection is made when the margin is >= 0.
 */
export interface MarginDistribution {
  readonly layoverMinutes: number;
  readonly mctMinutes: number;
  /** Integer margins, ascending. */
  readonly marginMinutes: readonly number[];
  /** P(margin <= x) for each x in marginMinutes. */
  readonly cdf: readonly number[];
  /** P(x - 1 < margin <= x): probability per one-minute bin ending at x. */
  readonly probability: readonly number[];
  /** Credible band of the cdf across posterior draws, at intervalLevel. */
  readonly cdfLo: readonly number[];
  readonly cdfHi: readonly number[];
  readonly intervalLevel: number;
  /** P(margin >= 0) = P(make). */
  readonly pMake: number;
}

/**
 * One MCT override, from a user's CSV or JSON file (IATA Resolution 765 defines the minimum
 * connecting time; the values are set per airport and are not public data).
 * type 'transfer' is the ground-transfer allowance added on an airport change.
 */
export interface MctRule {
  /** IATA code of the connecting (arrival) airport, or '*' for every airport. */
  readonly airport: string;
  readonly type: ConnectionType | 'transfer';
  readonly minutes: number;
  /** For 'transfer' only: the departure airport of the outbound leg; absent means any. */
  readonly departAirport?: string;
  /** Line (CSV) or array index + 1 (JSON) where the rule came from, for messages. */
  readonly line: number;
}

/** The inputs of scoreTrips besides the trips and the posterior source. */
export interface ScoreOptions {
  /** Target P(make) for the minimum layover; default 0.9. */
  readonly target?: number;
  /** Credible level of the intervals; default 0.9. */
  readonly intervalLevel?: number;
  /** Minutes to the later departure after a missed connection; default 180. */
  readonly rebookGapMinutes?: number;
  /** Per-trip rebook gap, by trip id; overrides rebookGapMinutes. */
  readonly rebookGapByTrip?: Readonly<Record<string, number>>;
  /** Monte Carlo simulations for trip delays and the group; default 2000. */
  readonly simulations?: number;
  readonly seed?: number;
  /** MCT overrides; later rules win over earlier ones, an airport's rule over '*'. */
  readonly mctRules?: readonly MctRule[];
  /** Ground-transfer allowance on an airport change when no rule gives one; default 90. */
  readonly transferMinutes?: number;
  /** ISO 3166-1 alpha-2 country of an IATA airport, or undefined when unknown. */
  readonly countryOf: (iata: string) => string | undefined;
}
