// Builds the manager report from scored trips: summary, key sentences, recommended changes,
// the trip table, chart data, group outlook, assumptions, data provenance and cautions.
//
// Written for a reader with two minutes and no statistics: natural frequencies beside every
// percentage, and each finding paired with the change that would reach the target.
import { RISK_CAUTION, type RouteEvidence, type ScoredConnection, type ScoredTrip, type ScoredTrips } from '../risk/types';
import { flagsPhrase } from './flag-words';
import { formatMinutes, formatPercent, formatPercentRange, formatSignedMinutes } from './format';
import { missFrequency, naturalFrequency } from './natural-frequency';
import type { ConnectionRow, LabelledValue, ManagerReport, OptionComparison, Recommendation, ReportOptions, ReportSummary, TripRow } from './report-model';
import type { ProbabilityRow } from './svg-charts';
import { connectionFlights, countedTrips, optionGroups, placeName, routeText, scoredConnections, tripLabel } from './trip-facts';

/** Rows per connection chart, so each chart fits on one printed page. */
export const CHART_ROWS_PER_PAGE = 30;

/** The cautions every manager report carries (issue: reports). */
export const REPORT_CAUTIONS: readonly string[] = [
  'These are estimates from historical delay data, not a guarantee. A connection that scores well can still be missed, and one that scores badly may work on the day.',
  'Cancellations, diversions and rare disruptions (storms, strikes, system outages) are not fully represented in delay data, so the real chance of a miss can be higher than shown.',
  "Airline rules decide what is protected: minimum connection times set by airports and airlines, and each airline's conditions of carriage, override anything in this report.",
  'Separate tickets are not protected. If a connection between separate tickets is missed, the next airline has no duty to carry the traveler, bags must be collected and re-checked, and a new ticket may be needed.',
];

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** "about 1 in 5 travelers on it would miss it", the form managers read in one pass. */
function missSentence(pMake: number): string {
  return `${missFrequency(pMake)} travelers on it would miss it`;
}

function onTimeMeaning(trip: ScoredTrip): string {
  return trip.onTimeBasis === 'deadline' ? 'by the deadline' : 'within 15 minutes of schedule';
}

function connectionRow(c: ScoredConnection, target: number): ConnectionRow {
  const scored = c.scored && c.pMake !== null;
  return {
    airport: c.airport === c.departAirport ? c.airport : `${c.airport} / ${c.departAirport}`,
    flights: connectionFlights(c),
    layover: formatMinutes(c.layoverMinutes),
    mct: formatMinutes(c.mctMinutes),
    minLayover: c.minLayoverMinutes === null ? (scored ? 'out of reach' : '—') : formatMinutes(c.minLayoverMinutes),
    margin: c.marginMinutes === null ? '—' : formatSignedMinutes(c.marginMinutes),
    pMake: c.pMake === null ? 'not scored' : formatPercent(c.pMake),
    interval: c.pMakeInterval === null ? '—' : formatPercentRange(c.pMakeInterval[0], c.pMakeInterval[1]),
    missFrequency: c.pMake === null ? '—' : missFrequency(c.pMake),
    flags: flagsPhrase(c.flags),
    belowTarget: c.pMake !== null && c.pMake < target,
  };
}

function tripRow(trip: ScoredTrip, counted: boolean, target: number): TripRow {
  const option =
    trip.optionCount > 1 ? `${trip.option} (ranked ${trip.optionRank} of ${trip.optionCount}${trip.paretoOptimal ? ', not beaten' : ''})` : trip.option;
  const first = trip.legs[0];
  return {
    traveler: trip.traveler,
    trip: trip.trip,
    option,
    route: routeText(trip),
    departs: first ? `${first.departLocal.replace('T', ' ')} ${first.from}` : '',
    pAllConnections: scoredConnections(trip).length === 0 ? 'no connection' : formatPercent(trip.pAllConnections),
    pAllInterval: scoredConnections(trip).length === 0 ? '—' : formatPercentRange(trip.pAllConnectionsInterval[0], trip.pAllConnectionsInterval[1]),
    onTime: `${formatPercent(trip.pOnTime)} ${onTimeMeaning(trip)}`,
    expectedDelay: formatMinutes(trip.expectedArrivalDelayMinutes),
    deadline: trip.deadlineLocal === null ? '—' : `${trip.deadlineLocal.replace('T', ' ')}: ${trip.pArriveByDeadline === null ? 'n/a' : formatPercent(trip.pArriveByDeadline)}`,
    counted,
    connections: trip.connections.map((c) => connectionRow(c, target)),
  };
}

function summarise(scored: ScoredTrips, counted: readonly ScoredTrip[]): ReportSummary {
  const connections = counted.flatMap(scoredConnections);
  const belowTarget = connections.filter((c) => c.pMake < scored.target).length;
  const belowMct = connections.filter((c) => c.flags.includes('below-mct')).length;
  const separateTickets = connections.filter((c) => c.flags.includes('separate-tickets')).length;
  const tripsWithOptions = counted.filter((t) => t.optionCount > 1).length;
  const { travelers, expectedMisconnecting } = scored.group;
  const pAtLeastOne = scored.group.pAtLeast['1'];
  const sentences = [
    `Layline scored ${plural(travelers, 'traveler')} on ${plural(counted.length, 'trip')} with ${plural(connections.length, 'connection')}` +
      (tripsWithOptions > 0 ? `, counting the best-ranked option of the ${plural(tripsWithOptions, 'trip')} that ${tripsWithOptions === 1 ? 'has' : 'have'} alternatives.` : '.'),
    belowTarget === 0
      ? `Every connection reaches the target of ${formatPercent(scored.target)}.`
      : `${capitalise(plural(belowTarget, 'connection'))} ${belowTarget === 1 ? 'is' : 'are'} below the target of ${formatPercent(scored.target)}.`,
    `Across the group, about ${expectedMisconnecting.toFixed(1)} of ${travelers} travelers are expected to miss at least one connection; ` +
      `the chance that at least one traveler misses is ${formatPercent(pAtLeastOne)} (${naturalFrequency(pAtLeastOne).text}).`,
  ];
  if (belowMct > 0) sentences.push(`${capitalise(plural(belowMct, 'connection'))} ${belowMct === 1 ? 'is' : 'are'} shorter than the minimum connection time.`);
  if (separateTickets > 0) sentences.push(`${capitalise(plural(separateTickets, 'connection'))} ${separateTickets === 1 ? 'is' : 'are'} on separate tickets, which the airlines do not protect.`);
  return {
    travelers,
    trips: counted.length,
    tripsWithOptions,
    connections: connections.length,
    belowTarget,
    belowMct,
    separateTickets,
    expectedMisconnecting,
    pAtLeastOneMisconnects: pAtLeastOne,
    target: scored.target,
    text: sentences.join(' '),
  };
}

function keyPoints(scored: ScoredTrips, counted: readonly ScoredTrip[]): string[] {
  const points: string[] = [];
  const all = counted.flatMap((trip) => scoredConnections(trip).map((c) => ({ trip, c })));
  const worst = [...all].sort((a, b) => a.c.pMake - b.c.pMake)[0];
  if (worst) {
    points.push(
      `The riskiest connection is ${worst.trip.traveler}'s at ${placeName(worst.c.airport)} (${connectionFlights(worst.c)}): ` +
        `with a ${formatMinutes(worst.c.layoverMinutes)} layover, ${missSentence(worst.c.pMake)}.`,
    );
  }
  const shared = scored.group.topConnections.find((t) => t.travelers > 1);
  if (shared) {
    points.push(
      `${shared.travelers} travelers share the ${shared.inboundFlight} → ${shared.outboundFlight} connection at ${placeName(shared.airport)}. ` +
        `They fly the same planes, so when the connection fails (${naturalFrequency(shared.pMiss).text} times) they all miss it together.`,
    );
  }
  const withDeadline = counted.filter((t) => t.pArriveByDeadline !== null);
  const late = withDeadline.filter((t) => (t.pArriveByDeadline ?? 0) < scored.target);
  if (withDeadline.length > 0) {
    points.push(
      late.length === 0
        ? `${withDeadline.length === 1 ? 'The one trip' : `All ${withDeadline.length} trips`} with a deadline arrive${withDeadline.length === 1 ? 's' : ''} in time with at least the target chance of ${formatPercent(scored.target)}.`
        : `${late.length} of ${plural(withDeadline.length, 'trip')} with a deadline ${late.length === 1 ? 'falls' : 'fall'} short of the ${formatPercent(scored.target)} target for arriving in time.`,
    );
  }
  const pNone = scored.group.countDistribution[0];
  if (pNone !== undefined && scored.group.travelers > 0) {
    points.push(`The chance that nobody in the group misses a connection is ${formatPercent(pNone)} (${naturalFrequency(pNone).text}).`);
  }
  return points;
}

/** "Ines Calloway" for one trip; "Ines Calloway, Tobias Wren and 3 more (5 travelers) · Harbor Week" for several. */
function whoText(trips: readonly ScoredTrip[]): string {
  const [first] = trips;
  if (!first) return '';
  if (trips.length === 1) return tripLabel(first);
  const names = trips.map((t) => (t.optionCount > 1 ? `${t.traveler} (option ${t.option})` : t.traveler));
  const shown = names.length <= 6 ? names.join(', ') : `${names.slice(0, 5).join(', ')} and ${names.length - 5} more`;
  const tripNames = [...new Set(trips.map((t) => t.trip))];
  return `${shown} (${trips.length} travelers)${tripNames.length === 1 && tripNames[0] ? ` · ${tripNames[0]}` : ''}`;
}

/** Groups items by a key, keeping first-seen order. */
function groupBy<T>(items: readonly T[], key: (t: T) => string): T[][] {
  const groups = new Map<string, T[]>();
  for (const item of items) {
    const k = key(item);
    const list = groups.get(k);
    if (list) list.push(item);
    else groups.set(k, [item]);
  }
  return [...groups.values()];
}

type Counted = { readonly trip: ScoredTrip; readonly c: ScoredConnection & { readonly pMake: number } };

/** A connection on the same flights, the same day and with the same layover is one decision, however many fly it. */
function connectionKey({ trip, c }: Counted): string {
  const inbound = trip.legs[c.inboundLeg];
  return [c.airport, c.departAirport, c.inboundFlight, inbound?.departLocal.slice(0, 10) ?? '', c.outboundFlight, c.layoverMinutes, c.pMake].join('|');
}

function connectionRecommendations(group: readonly Counted[], target: number): Recommendation[] {
  const first = group[0];
  if (!first) return [];
  const { c } = first;
  const out: Recommendation[] = [];
  const subject = `${whoText(group.map((g) => g.trip))} · ${c.airport} (${connectionFlights(c)})`;
  const interval = c.pMakeInterval ? `, 90% interval ${formatPercentRange(c.pMakeInterval[0], c.pMakeInterval[1])}` : '';
  if (c.pMake < target) {
    const finding = `A ${formatMinutes(c.layoverMinutes)} layover is made ${formatPercent(c.pMake)} of the time${interval}: ${missSentence(c.pMake)}.`;
    let action: string;
    if (c.minLayoverMinutes !== null) {
      const more = c.minLayoverMinutes - c.layoverMinutes;
      action =
        `A layover of at least ${formatMinutes(c.minLayoverMinutes)} reaches the ${formatPercent(target)} target: ` +
        `book an onward flight at least ${formatMinutes(more)} later, or an earlier inbound flight.`;
    } else {
      action = `No same-day layover reaches the ${formatPercent(target)} target: choose a different routing, or a night at ${placeName(c.airport)} before the onward flight.`;
    }
    if (c.flags.includes('below-mct')) {
      action += ` The layover is also shorter than the ${formatMinutes(c.mctMinutes)} minimum connection time, so the airline may refuse to sell or protect it.`;
    }
    out.push({ kind: 'connection', subject, finding, action });
  }
  if (c.flags.includes('separate-tickets')) {
    out.push({
      kind: 'separate-tickets',
      subject,
      finding: `These flights are on separate tickets: if the first is late, the second airline has no duty to rebook, and bags must be re-checked.`,
      action: `Book both flights on one ticket, or leave time well beyond the layover above and agree a fallback flight with the traveler.`,
    });
  }
  return out;
}

function recommendations(scored: ScoredTrips, counted: readonly ScoredTrip[]): Recommendation[] {
  const byRisk: Recommendation[] = [];
  const ranked = counted.flatMap((trip) => scoredConnections(trip).map((c) => ({ trip, c }))).sort((a, b) => a.c.pMake - b.c.pMake);
  for (const group of groupBy(ranked, connectionKey)) byRisk.push(...connectionRecommendations(group, scored.target));
  const late = counted.filter((t) => t.pArriveByDeadline !== null && t.pArriveByDeadline < scored.target && t.deadlineLocal !== null);
  const sameJourney = (t: ScoredTrip) => [t.deadlineLocal, t.pArriveByDeadline, ...t.legs.map((l) => `${l.flight}@${l.departLocal}`)].join('|');
  for (const group of groupBy(late, sameJourney)) {
    const [trip] = group;
    if (!trip || trip.pArriveByDeadline === null || trip.deadlineLocal === null) continue;
    byRisk.push({
      kind: 'deadline',
      subject: whoText(group),
      finding: `Arrives by the deadline (${trip.deadlineLocal.replace('T', ' ')} local) ${formatPercent(trip.pArriveByDeadline)} of the time: ${naturalFrequency(1 - trip.pArriveByDeadline).text} would be late.`,
      action: `Fly earlier, or arrive the day before: a night at the destination or the hub buys the margin the deadline needs.`,
    });
  }
  // Order: the costly kinds first (a missed connection, then a missed deadline), separate tickets last.
  const order: Record<Recommendation['kind'], number> = { connection: 0, deadline: 1, 'separate-tickets': 2 };
  return byRisk.map((r, i) => ({ r, i })).sort((a, b) => order[a.r.kind] - order[b.r.kind] || a.i - b.i).map((x) => x.r);
}

function optionComparisons(scored: ScoredTrips): OptionComparison[] {
  return optionGroups(scored)
    .filter((g) => g.length > 1)
    .map((options) => {
      const [best, next] = options as [ScoredTrip, ScoredTrip, ...ScoredTrip[]];
      const timeDiff = best.travelMinutes - next.travelMinutes;
      const timeText =
        timeDiff === 0 ? 'the same scheduled travel time' : `${formatMinutes(Math.abs(timeDiff))} ${timeDiff > 0 ? 'longer' : 'shorter'} from first departure to final arrival`;
      const title = [best.traveler, best.trip].filter(Boolean).join(' · ');
      const sentence =
        `Option ${best.option} is ranked first: on time (${onTimeMeaning(best)}) ${formatPercent(best.pOnTime)} of the time, ` +
        `versus ${formatPercent(next.pOnTime)} for option ${next.option}, with an expected delay of ${formatMinutes(best.expectedArrivalDelayMinutes)} ` +
        `against ${formatMinutes(next.expectedArrivalDelayMinutes)}, and ${timeText}.`;
      return {
        title,
        sentence,
        bars: options.map((o) => ({
          label: `Option ${o.option}`,
          pOnTime: o.pOnTime,
          paretoOptimal: o.paretoOptimal,
          detail: `all connections ${formatPercent(o.pAllConnections)} · ${formatMinutes(o.travelMinutes)} travel · expected delay ${formatMinutes(o.expectedArrivalDelayMinutes)}`,
        })),
      };
    });
}

function connectionChartRows(counted: readonly ScoredTrip[]): ProbabilityRow[] {
  const rows = new Map<string, ProbabilityRow & { travelers: number; base: string }>();
  for (const trip of counted) {
    for (const c of scoredConnections(trip)) {
      // A flight is its number and departure date; the label shows the local day of the connection.
      const inbound = trip.legs[c.inboundLeg];
      const key = `${c.airport}|${c.inboundFlight}|${inbound?.departLocal.slice(0, 10) ?? ''}|${c.outboundFlight}`;
      const date = inbound?.arriveLocal.slice(0, 10) ?? '';
      const seen = rows.get(key);
      const [lo, hi] = c.pMakeInterval ?? [c.pMake, c.pMake];
      if (seen) {
        seen.travelers += 1;
        continue;
      }
      rows.set(key, { label: '', base: `${c.airport} ${c.inboundFlight} → ${c.outboundFlight}, ${date.slice(5)}`, p: c.pMake, lo, hi, travelers: 1 });
    }
  }
  return [...rows.values()]
    .map((r) => ({ label: r.travelers > 1 ? `${r.base} (${r.travelers} travelers)` : r.base, p: r.p, lo: r.lo, hi: r.hi }))
    .sort((a, b) => a.p - b.p || a.label.localeCompare(b.label));
}

function chunk<T>(items: readonly T[], size: number): T[][] {
  const out: T[][] = [];
  for (let i = 0; i < items.length; i += size) out.push(items.slice(i, i + size));
  return out;
}

function groupSection(scored: ScoredTrips): ManagerReport['group'] {
  const g = scored.group;
  const text =
    `Travelers on the same flight share that flight's delay, so misses come in clusters; the figures below come from ${g.simulations.toLocaleString('en-US')} simulated days that keep them together. ` +
    `Expected travelers missing at least one connection: ${g.expectedMisconnecting.toFixed(1)} of ${g.travelers} (simulation error ±${g.expectedMisconnectingStdError.toFixed(2)}).`;
  const keys = ['1', '2', '3', '4', '5'] as const;
  const atLeast = keys
    .filter((k) => Number(k) <= g.travelers)
    .map((k) => ({ label: `At least ${k} ${k === '1' ? 'traveler misses' : 'travelers miss'}`, value: `${formatPercent(g.pAtLeast[k])} (${naturalFrequency(g.pAtLeast[k]).text})` }));
  const topConnections = g.topConnections.map(
    (t) =>
      `${t.airport}, ${t.inboundFlight} (${t.inboundDate}) → ${t.outboundFlight}: ${plural(t.travelers, 'traveler')}, missed ${naturalFrequency(t.pMiss).text} times; ` +
      `expected misses ${t.expectedMisses.toFixed(2)}.`,
  );
  return { text, atLeast, topConnections };
}

function distinctValues<T>(items: readonly T[], key: (t: T) => string): T[] {
  const seen = new Map<string, T>();
  for (const item of items) if (!seen.has(key(item))) seen.set(key(item), item);
  return [...seen.values()];
}

const CONNECTION_TYPE_WORDS: Readonly<Record<ScoredConnection['connectionType'], string>> = {
  domestic: 'domestic to domestic',
  international: 'international transit',
  'international-arrival': 'arriving from abroad',
  'international-departure': 'domestic to international',
};

function assumptions(scored: ScoredTrips): LabelledValue[] {
  const connections = scored.trips.flatMap((t) => t.connections);
  const mcts = distinctValues(connections, (c) => `${c.airport}|${c.departAirport}|${c.connectionType}|${c.mctMinutes}|${c.mctSource}`).sort(
    (a, b) => a.airport.localeCompare(b.airport) || a.connectionType.localeCompare(b.connectionType),
  );
  const mctText = mcts
    .map((c) => {
      const transfer = c.transferMinutes > 0 ? `, including ${formatMinutes(c.transferMinutes)} to reach ${c.departAirport}` : '';
      return `${c.airport} ${CONNECTION_TYPE_WORDS[c.connectionType]}: ${formatMinutes(c.mctMinutes)} (${c.mctSource === 'override' ? 'your override' : 'default'}${transfer})`;
    })
    .join('; ');
  const gaps = distinctValues(scored.trips, (t) => String(t.rebookGapMinutes));
  const gapText =
    gaps.length === 1 && gaps[0]
      ? `${formatMinutes(gaps[0].rebookGapMinutes)} from a missed connection to the next departure (all trips)`
      : scored.trips.map((t) => `${tripLabel(t)}: ${formatMinutes(t.rebookGapMinutes)}`).join('; ');
  return [
    { label: 'Target', value: `${formatPercent(scored.target)} chance of making each connection` },
    { label: 'Intervals', value: `${formatPercent(scored.intervalLevel)} credible intervals: the range the chance itself lies in, given the data` },
    {
      label: 'Minimum connection times',
      value:
        (scored.mct.source === 'defaults'
          ? 'Layline defaults by connection type (common practice, no published source)'
          : `Layline defaults with ${plural(scored.mct.overrides, 'override')} from your MCT file`) + (mctText ? `. Used: ${mctText}.` : '.'),
    },
    { label: 'Rebooking', value: gapText },
    { label: 'On time', value: 'by the deadline where a trip has one; otherwise within 15 minutes of the scheduled arrival (US BTS on-time definition)' },
    { label: 'Group', value: 'each trip counts its best-ranked option; travelers on the same flight share its delay' },
    { label: 'Simulation', value: `${scored.simulations.toLocaleString('en-US')} simulated days, seed ${scored.seed}` },
  ];
}

function evidenceText(e: RouteEvidence): string {
  const base =
    e.pooling === 'route'
      ? `${e.flights.toLocaleString('en-US')} flights`
      : e.pooling === 'airports'
        ? 'pooled: route not in the data, estimated from its airports'
        : 'pooled: an airport not in the data, population average only';
  return e.derived ? `${base} (${e.kind === 'departure' ? 'departures derived from arrivals' : 'derived'})` : base;
}

function provenance(scored: ScoredTrips, options: ReportOptions): ManagerReport['provenance'] {
  const bundle: LabelledValue[] = [
    { label: 'Bundle', value: scored.bundle.id },
    { label: 'Model', value: scored.bundle.model },
    { label: 'Source', value: scored.bundle.source },
  ];
  const d = options.bundleDetails;
  if (d?.dateRange) bundle.push({ label: 'Flights dated', value: `${d.dateRange.first} to ${d.dateRange.last}` });
  if (d?.flights !== undefined) bundle.push({ label: 'Flights in the fit', value: d.flights.toLocaleString('en-US') });
  if (d?.note) bundle.push({ label: 'Note', value: d.note });
  const evidence = distinctValues(
    scored.trips.flatMap((t) => t.connections.flatMap((c) => [c.inbound, c.outbound])).filter((e): e is RouteEvidence => e !== null),
    (e) => `${e.origin}|${e.destination}|${e.kind}`,
  ).sort((a, b) => a.origin.localeCompare(b.origin) || a.destination.localeCompare(b.destination) || a.kind.localeCompare(b.kind));
  const routes = evidence.map((e) => ({ label: `${e.origin} → ${e.destination}, ${e.kind === 'arrival' ? 'arrivals' : 'departures'}`, value: evidenceText(e) }));
  return { bundle, routes };
}

function cautions(scored: ScoredTrips): string[] {
  const list = [...REPORT_CAUTIONS];
  const pooled = scored.trips.some((t) => t.connections.some((c) => c.flags.includes('pooled-route')));
  if (pooled) list.push('Where a route had no flights of its own in the data, its estimate is pooled from similar routes and is less certain: its interval is wider.');
  // The engine's standard caution says what the first and third cautions say; a different one is added.
  if (scored.caution && scored.caution !== RISK_CAUTION && !list.includes(scored.caution)) list.push(scored.caution);
  return list;
}

/**
 * The manager report for a set of scored trips.
 *
 * Pure and deterministic: the same scores and options give the same report.
 */
export function buildManagerReport(scored: ScoredTrips, options: ReportOptions): ManagerReport {
  const counted = countedTrips(scored);
  const countedSet = new Set(counted);
  const trips = optionGroups(scored).flat();
  const title = options.title ?? 'Connection risk report';
  return {
    kind: 'manager',
    title,
    subtitle: [options.organisation, `generated ${options.generatedAt.replace('T', ' ').replace(/(:\d{2})(\.\d+)?Z$/, '$1 UTC')}`].filter(Boolean).join(' · '),
    generatedAt: options.generatedAt,
    summary: summarise(scored, counted),
    keyPoints: keyPoints(scored, counted),
    recommendations: recommendations(scored, counted),
    trips: trips.map((t) => tripRow(t, countedSet.has(t), scored.target)),
    connectionChart: {
      title: `Chance of making each connection against the ${formatPercent(scored.target)} target`,
      chunks: chunk(connectionChartRows(counted), CHART_ROWS_PER_PAGE),
    },
    optionComparisons: optionComparisons(scored),
    group: groupSection(scored),
    assumptions: assumptions(scored),
    provenance: provenance(scored, options),
    cautions: cautions(scored),
    problems: scored.problems,
    target: scored.target,
  };
}
