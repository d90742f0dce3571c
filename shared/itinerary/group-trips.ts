// Groups normalised legs into trips (traveler + trip + option, in time order) and derives the
// connections between consecutive legs with their flags, and each trip's deadline.
//
// Layover = next departure instant − arrival instant, in whole minutes; over 24 h is a stopover.
import { findAirport } from '../time/airports';
import { formatOffset, formatUtc, formatWallTime, offsetChangesBetween, offsetMinutesAt, resolveLocalTime, wallTimeAt } from '../time/zones';
import { addDays, parseLocalDateTime } from './local-time';
import { instantOrProblem, LineProblems, makeProblem, type ReadLeg } from './normalise-leg';
import type { Connection, ConnectionFlag, Leg, Problem, Trip } from './types';

/** A gap longer than this between two legs is a stopover, not a connection (common practice, no source). */
export const STOPOVER_MINUTES = 24 * 60;

/** FNV-1a, 32 bit, over the three grouping fields with a separator no field can confuse: a short stable id. */
function tripHash(fields: readonly string[]): string {
  let h = 0x811c9dc5;
  for (const text of fields) {
    for (let i = 0; i < text.length; i++) {
      h ^= text.charCodeAt(i);
      h = Math.imul(h, 0x01000193) >>> 0;
    }
    // 0x1_0000 is not a UTF-16 code unit, so ('ab', 'c') and ('a', 'bc') hash differently.
    h ^= 0x10000;
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, '0');
}

/** True when two `YYYY-MM-DDTHH:MM` strings fall on different calendar days. */
function differentDays(a: string, b: string): boolean {
  for (let i = 0; i < 10; i++) if (a.charCodeAt(i) !== b.charCodeAt(i)) return true;
  return false;
}

export function connectionBetween(inbound: Leg, outbound: Leg, inboundLeg: number): Connection {
  const layoverMinutes = Math.round((outbound.departUtcMs - inbound.arriveUtcMs) / 60_000);
  const flags: ConnectionFlag[] = [];
  if (layoverMinutes < 0) flags.push('negative-layover');
  if (layoverMinutes > STOPOVER_MINUTES) flags.push('stopover');
  if (inbound.to !== outbound.from) flags.push('airport-change');
  if (inbound.booking !== '' && outbound.booking !== '' && inbound.booking !== outbound.booking) flags.push('separate-tickets');
  if (layoverMinutes >= 0 && differentDays(inbound.arriveLocal, outbound.departLocal)) flags.push('overnight');
  if (layoverMinutes > 0) {
    const changesAt = (zone: string) => offsetChangesBetween(zone, inbound.arriveUtcMs, outbound.departUtcMs).length > 0;
    if (changesAt(inbound.toZone) || (outbound.fromZone !== inbound.toZone && changesAt(outbound.fromZone))) flags.push('dst-change-during-trip');
  }
  return { airport: inbound.to, departAirport: outbound.from, inboundLeg, layoverMinutes, flags };
}

interface Group {
  readonly traveler: string;
  readonly trip: string;
  readonly option: string;
  readonly members: ReadLeg[];
}

export function groupTrips(readLegs: readonly ReadLeg[], problems: Problem[]): Trip[] {
  // Nested maps rather than a joined string key: no key is built or hashed per leg.
  const byTraveler = new Map<string, Map<string, Map<string, Group>>>();
  const groups: Group[] = [];
  for (const r of readLegs) {
    let byTrip = byTraveler.get(r.traveler);
    if (!byTrip) byTraveler.set(r.traveler, (byTrip = new Map()));
    let byOption = byTrip.get(r.trip);
    if (!byOption) byTrip.set(r.trip, (byOption = new Map()));
    let g = byOption.get(r.option);
    if (!g) {
      g = { traveler: r.traveler, trip: r.trip, option: r.option, members: [] };
      byOption.set(r.option, g);
      groups.push(g);
    }
    g.members.push(r);
  }

  const trips: Trip[] = [];
  const usedIds = new Set<string>();
  for (const g of groups) {
    const sorted = [...g.members].sort((a, b) => a.leg.departUtcMs - b.leg.departUtcMs || a.leg.line - b.leg.line);
    const members: ReadLeg[] = [];
    for (const m of sorted) {
      // Sorted by departure, so a repeated leg sits among the kept legs with the same departure instant.
      let twin: ReadLeg | undefined;
      for (let k = members.length - 1; k >= 0; k--) {
        const other = members[k];
        if (!other || other.leg.departUtcMs !== m.leg.departUtcMs) break;
        if (other.leg.from === m.leg.from && other.leg.flight === m.leg.flight) twin = other;
      }
      if (twin) {
        problems.push(makeProblem(m.leg.line, 'warning', 'duplicate-leg', `the same flight as line ${twin.leg.line} (${m.leg.flight || 'no flight number'} ${m.leg.from} ${m.leg.departLocal}); counted once`, m.text));
        continue;
      }
      members.push(m);
    }
    const legs = members.map((m) => m.leg);
    const connections: Connection[] = [];
    for (let i = 0; i + 1 < legs.length; i++) {
      const inbound = legs[i];
      const outbound = legs[i + 1];
      if (!inbound || !outbound) continue;
      const c = connectionBetween(inbound, outbound, i);
      if (c.flags.includes('negative-layover')) {
        problems.push(
          makeProblem(
            outbound.line,
            'error',
            'negative-layover',
            `${outbound.flight || 'this leg'} leaves ${outbound.from} at ${outbound.departLocal} (${outbound.departUtc}), ${-c.layoverMinutes} min before ${inbound.flight || 'the previous leg'} (line ${inbound.line}) arrives at ${inbound.to} at ${inbound.arriveLocal} (${inbound.arriveUtc})`,
            members[i + 1]?.text,
          ),
        );
      }
      connections.push(c);
    }
    tripDstWarning(legs, members[0]?.text, problems);
    const deadline = tripDeadline(members, legs, problems);

    const hash = tripHash([g.traveler, g.trip, g.option]);
    let id = `trip-${hash}`;
    for (let n = 2; usedIds.has(id); n++) id = `trip-${hash}-${n}`;
    usedIds.add(id);
    trips.push({ id, traveler: g.traveler, trip: g.trip, option: g.option, legs, connections, deadlineLocal: deadline?.local ?? null, deadlineUtc: deadline?.utc ?? null });
  }
  return trips;
}

/** Warns once per trip when any of its airports changes clocks between first departure and last arrival. */
function tripDstWarning(legs: readonly Leg[], text: string | undefined, problems: Problem[]): void {
  const first = legs[0];
  const last = legs[legs.length - 1];
  if (!first || !last) return;
  let end = first.arriveUtcMs;
  const zones = new Set<string>();
  for (const l of legs) {
    if (l.arriveUtcMs > end) end = l.arriveUtcMs;
    zones.add(l.fromZone);
    zones.add(l.toZone);
  }
  const seen: string[] = [];
  for (const zone of zones) {
    for (const t of offsetChangesBetween(zone, first.departUtcMs, end)) {
      seen.push(`${zone} changes from ${formatOffset(offsetMinutesAt(zone, t - 60_000))} to ${formatOffset(offsetMinutesAt(zone, t))} at ${formatUtc(t)}`);
    }
  }
  if (seen.length) {
    const listed = seen.length > 3 ? [...seen.slice(0, 3), `${seen.length - 3} more`] : seen;
    problems.push(makeProblem(first.line, 'warning', 'dst-change-during-trip', `clocks change during this trip: ${listed.join('; ')}; local times before and after use different UTC offsets`, text));
  }
}

function tripDeadline(members: readonly ReadLeg[], legs: readonly Leg[], problems: Problem[]): { local: string; utc: string } | null {
  const withDeadline = members.filter((m) => m.deadline.trim() !== '');
  const last = legs[legs.length - 1];
  const first = withDeadline[0];
  if (!first || !last) return null;
  for (const m of withDeadline) {
    if (m.deadline.trim() !== first.deadline.trim()) {
      problems.push(makeProblem(m.leg.line, 'warning', 'deadline-conflict', `deadline '${m.deadline.trim()}' differs from '${first.deadline.trim()}' on line ${first.leg.line}; used line ${first.leg.line}'s`, m.text));
    }
  }
  const p = new LineProblems(first.leg.line, first.text);
  const destination = findAirport(last.to);
  const parsed = parseLocalDateTime(first.deadline);
  if (!destination) return null;
  if (!parsed.ok) {
    p.error('invalid-deadline', `deadline: ${parsed.message}`);
    problems.push(...p.list);
    return null;
  }
  const arrivalWall = wallTimeAt(destination.zone, last.arriveUtcMs);
  const arrivalDate = arrivalWall ? { year: arrivalWall.year, month: arrivalWall.month, day: arrivalWall.day } : null;
  const date = parsed.value.date ?? (arrivalDate ? addDays(arrivalDate, parsed.value.dayOffset ?? 0) : null);
  if (!date) return null;
  const w = { ...date, ...parsed.value.time };
  const utcMs = instantOrProblem(resolveLocalTime(destination.zone, w), w, destination.zone, `deadline at ${destination.iata}`, p);
  if (utcMs !== null && utcMs < last.arriveUtcMs) {
    p.warn('deadline-before-arrival', `the trip arrives at ${destination.iata} at ${last.arriveLocal}, after its deadline ${formatWallTime(w)}`);
  }
  problems.push(...p.list);
  return utcMs === null ? null : { local: formatWallTime(w), utc: formatUtc(utcMs) };
}
