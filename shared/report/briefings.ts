// Builds the per-traveler briefings: one page per traveler's trip, in plain words with no
// statistics. Every leg in local time with its day and zone, each connection's chance as
// a natural frequency, the connection to watch and why, and what to do if one is missed.
import type { ScoredConnection, ScoredTrip, ScoredTrips } from '../risk/types';
import { formatMinutes, localDayDifference, localTimeParts } from './format';
import { naturalFrequency } from './natural-frequency';
import type { Briefing, BriefingConnection, BriefingLeg, BriefingsReport, ReportOptions } from './report-model';
import { connectionFlights, countedTrips, placeName, scoredConnections } from './trip-facts';

/** The line at the foot of every briefing: the caution, in a traveler's words. */
export const BRIEFING_CAUTION =
  'These chances come from how late flights like yours ran in the past. They are a guide, not a promise: cancellations and rare disruptions are not fully counted, ' +
  "and on the day the airline's rules and staff decide.";

function chanceSentence(pMake: number, target: number): string {
  const miss = naturalFrequency(1 - pMake).text;
  if (pMake >= target) return `Most days this works: ${miss} travelers on this connection miss it.`;
  return `This one is tight: ${miss} travelers on this connection miss it.`;
}

function connectionNotes(c: ScoredConnection): string[] {
  const notes: string[] = [];
  if (c.flags.includes('separate-tickets')) notes.push('Separate tickets: you must collect your bags and check in again.');
  if (c.airport !== c.departAirport) notes.push(`Change of airport: you land at ${placeName(c.airport)} and leave from ${placeName(c.departAirport)}.`);
  if (c.flags.includes('overnight')) notes.push('Overnight connection.');
  if (c.flags.includes('stopover')) notes.push('A stopover of more than a day.');
  if (c.flags.includes('below-mct')) notes.push('Shorter than the usual minimum time to change planes here.');
  return notes;
}

function legs(trip: ScoredTrip): BriefingLeg[] {
  return trip.legs.map((leg) => {
    const days = localDayDifference(leg.departLocal, leg.arriveLocal);
    return {
      flight: leg.flight,
      from: placeName(leg.from),
      to: placeName(leg.to),
      depart: localTimeParts(leg.departLocal, leg.departUtcMs, leg.fromZone),
      arrive: localTimeParts(leg.arriveLocal, leg.arriveUtcMs, leg.toZone),
      dayChange: days > 0 ? `+${days}` : days < 0 ? `${days}` : '',
      booking: leg.booking,
    };
  });
}

/** A connection the traveler must watch: below the target, or unprotected on separate tickets. */
function watchesConnection(c: ScoredConnection & { readonly pMake: number }, target: number): boolean {
  return c.pMake < target || c.flags.includes('separate-tickets');
}

/** The connection to watch: one below the target or on separate tickets first, then the tightest. */
function connectionToWatch(trip: ScoredTrip, target: number): (ScoredConnection & { readonly pMake: number }) | undefined {
  const rank = (c: ScoredConnection & { readonly pMake: number }) => (watchesConnection(c, target) ? 0 : 1);
  return [...scoredConnections(trip)].sort((a, b) => rank(a) - rank(b) || a.pMake - b.pMake)[0];
}

function watchSection(trip: ScoredTrip, target: number): Briefing['watch'] {
  const scored = scoredConnections(trip);
  if (trip.connections.length === 0) return { heading: 'No connection on this trip', why: ['Your flight is nonstop: there is no connection to make.'] };
  const tightest = connectionToWatch(trip, target);
  if (!tightest) return { heading: 'No connection to watch', why: ['Your flights are more than a day apart, so no connection is at risk.'] };
  const place = placeName(tightest.airport);
  const why: string[] = [];
  const spare = tightest.layoverMinutes - tightest.mctMinutes;
  if (spare > 0) {
    why.push(
      `You have ${formatMinutes(tightest.layoverMinutes)} between flights, and changing planes here takes about ${formatMinutes(tightest.mctMinutes)}. ` +
        `If your first flight (${tightest.inboundFlight}) lands more than about ${formatMinutes(spare)} late, this connection is at risk.`,
    );
  } else {
    why.push(
      `You have ${formatMinutes(tightest.layoverMinutes)} between flights, less than the ${formatMinutes(tightest.mctMinutes)} usually needed to change planes here. ` +
        'Ask your coordinator to confirm the airline accepts this connection.',
    );
  }
  if (tightest.flags.includes('separate-tickets')) why.push('Your two flights are on separate tickets, so the second airline will not wait for you or rebook you.');
  if (tightest.airport !== tightest.departAirport) why.push(`You also change airports, from ${place} to ${placeName(tightest.departAirport)}, which takes time.`);
  const heading = watchesConnection(tightest, target)
    ? `Watch your connection at ${place}`
    : scored.length > 1
      ? `All your connections have time to spare; the tightest is at ${place}`
      : `Your connection at ${place} has time to spare`;
  return { heading, why };
}

function ifMissed(trip: ScoredTrip): string[] {
  const out: string[] = [];
  const scored = trip.connections.filter((c) => c.scored);
  const protectedOnes = scored.filter((c) => !c.flags.includes('separate-tickets'));
  const separate = scored.filter((c) => c.flags.includes('separate-tickets'));
  const rebook = `Expect to arrive later than planned: the next flight can be hours away (we plan for about ${formatMinutes(trip.rebookGapMinutes)}).`;
  if (protectedOnes.length > 0) {
    const where = [...new Set(protectedOnes.map((c) => placeName(c.airport)))].join(' or ');
    out.push(
      `${separate.length > 0 ? 'Where your flights are on one booking' : 'Your flights are on one booking'}, so if you miss a connection the airline rebooks you: ` +
        `go to the airline's transfer desk at ${where}, or use the airline's app. You do not need to buy a new ticket.`,
    );
  }
  for (const c of separate) {
    out.push(
      `Your connection at ${placeName(c.airport)} (${connectionFlights(c)}) is on separate tickets. If you miss it, you are on your own: ` +
        'the second airline does not have to rebook you. You must collect your bags, check them in again and go back through security. ' +
        'Agree a fallback with your coordinator before you travel: which later flight to take, and who pays for it.',
    );
  }
  if (scored.length > 0) {
    out.push(rebook);
    const bookings = [...new Set(trip.legs.map((l) => l.booking).filter(Boolean))];
    out.push(`Tell your coordinator your new flight${bookings.length > 0 ? `, and keep your booking reference${bookings.length > 1 ? 's' : ''} (${bookings.join(', ')}) at hand` : ''}.`);
  }
  return out;
}

function deadlineSentence(trip: ScoredTrip, target: number): string | null {
  if (trip.deadlineLocal === null || trip.deadlineUtc === null || trip.pArriveByDeadline === null) return null;
  const last = trip.legs[trip.legs.length - 1];
  const zone = last?.toZone ?? '';
  const at = localTimeParts(trip.deadlineLocal, Date.parse(trip.deadlineUtc), zone);
  const f = naturalFrequency(trip.pArriveByDeadline);
  const base = `You need to be in ${last ? placeName(last.to) : 'your destination'} by ${at.day}, ${at.time} local time (${at.zone}). On days like this, travelers arrive in time ${f.text} times.`;
  return trip.pArriveByDeadline >= target ? base : `${base} That is tight: talk to your coordinator about an earlier flight or arriving the day before.`;
}

function briefing(trip: ScoredTrip, target: number): Briefing {
  const first = trip.legs[0];
  const last = trip.legs[trip.legs.length - 1];
  const connections: BriefingConnection[] = [];
  const tightest = connectionToWatch(trip, target);
  for (const c of trip.connections) {
    connections.push({
      place: placeName(c.airport),
      flights: connectionFlights(c),
      layover: formatMinutes(c.layoverMinutes),
      chance: c.scored && c.pMake !== null ? chanceSentence(c.pMake, target) : 'A stopover, not a connection: you have more than a day here.',
      notes: connectionNotes(c),
      mark: tightest !== c ? '' : watchesConnection(tightest, target) ? 'watch' : 'tightest',
    });
  }
  const overview =
    first && last
      ? `From ${placeName(first.from)} on ${localTimeParts(first.departLocal, first.departUtcMs, first.fromZone).day} to ${placeName(last.to)}, ` +
        `${trip.legs.length === 1 ? 'nonstop' : `with ${trip.connections.length === 1 ? 'one connection' : `${trip.connections.length} connections`}`}. All times are local.`
      : 'No flights.';
  return {
    traveler: trip.traveler,
    trip: trip.trip,
    optionNote:
      trip.optionCount > 1
        ? `This briefing covers option ${trip.option}, the one Layline ranks first of ${trip.optionCount}. Your coordinator will confirm which option is booked.`
        : '',
    overview,
    legs: legs(trip),
    connections,
    watch: watchSection(trip, target),
    ifMissed: ifMissed(trip),
    deadline: deadlineSentence(trip, target),
  };
}

/**
 * One briefing per traveler's trip (its best-ranked option), ordered by traveler.
 *
 * Pure and deterministic: the same scores and options give the same briefings.
 */
export function buildBriefings(scored: ScoredTrips, options: ReportOptions): BriefingsReport {
  const trips = countedTrips(scored)
    .map((t, i) => ({ t, i }))
    .sort((a, b) => a.t.traveler.localeCompare(b.t.traveler) || a.i - b.i)
    .map((x) => x.t);
  return {
    kind: 'briefings',
    title: options.title ?? 'Travel briefings',
    subtitle: [options.organisation, `prepared ${options.generatedAt.slice(0, 10)}`].filter(Boolean).join(' · '),
    generatedAt: options.generatedAt,
    briefings: trips.map((t) => briefing(t, scored.target)),
    caution: BRIEFING_CAUTION,
  };
}
