// What the engine sends the screens: parsed and scored trips, the group summary, and a
// connection's curves. Declared as valibot schemas so both sides of the contract check it.
//
// Probabilities are in [0, 1]; a null means "not scored" and comes with a reason in words.
import * as v from 'valibot';

const Probability = v.pipe(v.number(), v.minValue(0), v.maxValue(1));
const Minutes = v.pipe(v.number(), v.integer());
const NullableProbability = v.nullable(Probability);

export const ProblemSchema = v.object({
  line: v.pipe(v.number(), v.integer(), v.minValue(0)),
  severity: v.picklist(['error', 'warning']),
  code: v.string(),
  message: v.string(),
});

export const LegViewSchema = v.object({
  flight: v.string(),
  from: v.string(),
  to: v.string(),
  departLocal: v.string(),
  arriveLocal: v.string(),
  departUtc: v.string(),
  arriveUtc: v.string(),
  /** Zone abbreviations at the two instants, e.g. 'EST', 'CDT'. */
  departZoneAbbr: v.string(),
  arriveZoneAbbr: v.string(),
  /** Calendar days between the leg's local departure and local arrival dates (−1, 0, +1, +2). */
  arriveDayOffset: Minutes,
  durationMinutes: Minutes,
  line: Minutes,
  booking: v.string(),
});
export type LegView = v.InferOutput<typeof LegViewSchema>;

export const RouteDataSchema = v.object({
  origin: v.string(),
  destination: v.string(),
  kind: v.picklist(['arrival', 'departure']),
  pooling: v.picklist(['route', 'airports', 'population']),
  flights: Minutes,
});
export type RouteData = v.InferOutput<typeof RouteDataSchema>;

export const ConnectionViewSchema = v.object({
  /** Position among the trip's connections. */
  index: Minutes,
  airport: v.string(),
  departAirport: v.string(),
  inboundLeg: Minutes,
  layoverMinutes: Minutes,
  flags: v.array(v.string()),
  mctMinutes: v.nullable(Minutes),
  pMake: NullableProbability,
  pMakeLo: NullableProbability,
  pMakeHi: NullableProbability,
  /** Smallest layover reaching the target; null when not scored or when no layover within reach does. */
  minLayoverMinutes: v.nullable(Minutes),
  marginMinutes: v.nullable(Minutes),
  /** The posteriors behind the score: inbound arrivals, outbound departures. */
  data: v.array(RouteDataSchema),
  /** Why there is no score, in words, when pMake is null. */
  unscoredReason: v.nullable(v.string()),
  connectionType: v.nullable(v.string()),
  mctSource: v.nullable(v.picklist(['default', 'override'])),
  /** Cautions in plain words (separate tickets, airport change, pooled data…). */
  warnings: v.array(v.object({ code: v.string(), message: v.string() })),
});
export type ConnectionView = v.InferOutput<typeof ConnectionViewSchema>;

export const TripViewSchema = v.object({
  id: v.string(),
  traveler: v.string(),
  trip: v.string(),
  option: v.string(),
  legs: v.array(LegViewSchema),
  connections: v.array(ConnectionViewSchema),
  deadlineLocal: v.nullable(v.string()),
  totalTravelMinutes: Minutes,
  pAllConnections: NullableProbability,
  pAllLo: NullableProbability,
  pAllHi: NullableProbability,
  expectedArrivalDelayMinutes: v.nullable(v.number()),
  pArriveByDeadline: NullableProbability,
  /** P(on-time arrival): by the deadline when there is one, else within 15 minutes of schedule. */
  pOnTime: NullableProbability,
  onTimeBasis: v.nullable(v.picklist(['deadline', 'within-15-minutes'])),
  arrivalDelayP90Minutes: v.nullable(v.number()),
  paretoOptimal: v.boolean(),
  /** Key shared by the options of one traveler's trip. */
  optionGroup: v.string(),
  /** 1 = best among the options; 1 when there are none. */
  optionRank: Minutes,
  /** How many options this traveler's trip has (1 when there are no alternatives). */
  optionCount: Minutes,
});
export type TripView = v.InferOutput<typeof TripViewSchema>;

export const GroupViewSchema = v.object({
  travelers: Minutes,
  expectedMisconnecting: v.number(),
  /** P(exactly k travelers miss a connection), k = 0…; the last entry is "this many or more". */
  countDistribution: v.array(Probability),
  pAtLeast: v.array(v.object({ k: Minutes, p: Probability })),
  expectedMisconnectingStdError: v.number(),
  simulations: Minutes,
  topConnections: v.array(
    v.object({
      airport: v.string(),
      inboundFlight: v.string(),
      inboundDate: v.string(),
      outboundFlight: v.string(),
      travelers: Minutes,
      pMiss: Probability,
      /** Expected misconnecting travelers this connection accounts for. */
      expectedMisses: v.number(),
    }),
  ),
  atRisk: v.array(v.object({ traveler: v.string(), tripId: v.string(), pMiss: Probability })),
});
export type GroupView = v.InferOutput<typeof GroupViewSchema>;

export const BundleViewSchema = v.object({
  id: v.string(),
  model: v.string(),
  source: v.string(),
  /** Where the bundle's data came from and what it covers; absent for a source that is not a bundle file. */
  provenance: v.optional(
    v.object({
      title: v.string(),
      license: v.string(),
      dateFirst: v.string(),
      dateLast: v.string(),
      flights: v.number(),
      routes: v.number(),
      airports: v.number(),
      method: v.string(),
    }),
  ),
});
export type BundleView = v.InferOutput<typeof BundleViewSchema>;

export const AnalysisSchema = v.object({
  /** Names this analysis for follow-up requests (connection curves). */
  analysisId: v.string(),
  format: v.picklist(['csv', 'tsv', 'text', 'ics', 'empty']),
  problems: v.array(ProblemSchema),
  trips: v.array(TripViewSchema),
  group: v.nullable(GroupViewSchema),
  bundle: v.nullable(BundleViewSchema),
  /** Set when the trips were read but could not be scored (e.g. no posterior bundle). */
  scoringError: v.nullable(v.string()),
  targetProbability: Probability,
  intervalLevel: Probability,
  caution: v.string(),
  parseMs: v.number(),
  scoreMs: v.number(),
});
export type Analysis = v.InferOutput<typeof AnalysisSchema>;

export const CurvePointSchema = v.object({ layoverMinutes: Minutes, p: Probability, lo: Probability, hi: Probability });
export type CurvePoint = v.InferOutput<typeof CurvePointSchema>;

export const ConnectionCurveSchema = v.object({
  tripId: v.string(),
  connectionIndex: Minutes,
  layoverMinutes: Minutes,
  mctMinutes: Minutes,
  targetProbability: Probability,
  minLayoverMinutes: v.nullable(Minutes),
  /** P(make) and its 90% credible band against the layover. */
  points: v.array(CurvePointSchema),
  /** Predictive probability of the margin (layover − MCT − (A − D)) falling in (marginMinutes, marginMinutes + binMinutes]; made when the margin is ≥ 0. */
  margin: v.array(v.object({ marginMinutes: Minutes, probability: Probability })),
  binMinutes: Minutes,
});
export type ConnectionCurve = v.InferOutput<typeof ConnectionCurveSchema>;
