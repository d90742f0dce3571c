// Validates delay-history rows one at a time and keeps the valid ones in compact typed arrays.
//
// Readers (CSV, Parquet) hand each row's cells over in HISTORY_FIELDS order; the table counts
// invalid rows by reason with a few samples of each, counts cancelled and diverted flights
// apart (they have no arrival delay and are never treated as on time), and stores about
// 12 bytes per valid flight, so millions of rows fit in little memory.
import { HISTORY_FIELDS, type HistoryField } from './columns';
import { CLEANING_RULE } from '../delay/evaluation/flight-columns';
import { formatDay, isEmptyCell, parseAirportCode, parseCarrierCode, parseFlag, parseFlightDate, parseHhmm, parseNumberCell, type Cell } from './cells';

// The same delay bounds as the bundled fit's cleaning rule (see CLEANING_RULE for why), so a
// user's history and the bundled sample are cleaned alike.
const MIN_DELAY = CLEANING_RULE.minDelayMinutes;
const MAX_DELAY_EXCLUSIVE = CLEANING_RULE.maxDelayMinutesExclusive;

export const INVALID_REASONS = [
  'too-few-fields',
  'missing-date',
  'bad-date',
  'bad-origin',
  'bad-destination',
  'same-origin-and-destination',
  'bad-cancelled-flag',
  'bad-diverted-flag',
  'missing-arrival-delay',
  'bad-arrival-delay',
  'implausible-arrival-delay',
  'bad-departure-delay',
  'implausible-departure-delay',
  'bad-carrier',
  'bad-scheduled-departure',
] as const;

export type InvalidReason = (typeof INVALID_REASONS)[number];

export const INVALID_REASON_LABELS: Readonly<Record<InvalidReason, string>> = {
  'too-few-fields': 'the row has fewer fields than the header',
  'missing-date': 'no flight date',
  'bad-date': 'the flight date is not a date (YYYY-MM-DD, M/D/YYYY or YYYYMMDD)',
  'bad-origin': 'the origin is not a three-letter IATA airport code',
  'bad-destination': 'the destination is not a three-letter IATA airport code',
  'same-origin-and-destination': 'origin and destination are the same airport',
  'bad-cancelled-flag': 'the cancelled flag is not 0/1 or true/false',
  'bad-diverted-flag': 'the diverted flag is not 0/1 or true/false',
  'missing-arrival-delay': 'no arrival delay on a flight not marked cancelled or diverted',
  'bad-arrival-delay': 'the arrival delay is not a number',
  'implausible-arrival-delay': `the arrival delay is below ${MIN_DELAY} minutes or ${MAX_DELAY_EXCLUSIVE} minutes or more (a recording error)`,
  'bad-departure-delay': 'the departure delay is not a number',
  'implausible-departure-delay': `the departure delay is below ${MIN_DELAY} minutes or ${MAX_DELAY_EXCLUSIVE} minutes or more (a recording error)`,
  'bad-carrier': 'the carrier is not a two- or three-character airline code',
  'bad-scheduled-departure': 'the scheduled departure is not a local time written hhmm',
};

/** Up to this many sample rows are kept per invalid reason. */
export const SAMPLES_PER_REASON = 5;

export interface InvalidSample {
  /** 1-based row number in the file, counting the header as row 1 for text files. */
  readonly row: number;
  /** The mapped cells as text, by field. */
  readonly cells: Partial<Record<HistoryField, string>>;
}

export interface InvalidCount {
  readonly reason: InvalidReason;
  readonly label: string;
  readonly count: number;
  readonly samples: readonly InvalidSample[];
}

export interface ImportSummary {
  /** Data rows read, header excluded. */
  readonly rows: number;
  /** Flights with an arrival delay, kept for fitting. */
  readonly flights: number;
  /** Of those, flights that also have a departure delay. */
  readonly departureDelays: number;
  /** Diverted flights whose departure delay was kept (they did depart). */
  readonly divertedDepartures: number;
  readonly cancelled: number;
  readonly diverted: number;
  /** Rows rejected, all reasons together. */
  readonly invalid: number;
  readonly invalidByReason: readonly InvalidCount[];
  /** Delays given with a fraction of a minute, rounded to the nearest minute. */
  readonly roundedDelays: number;
  readonly firstDate: string | null;
  readonly lastDate: string | null;
  readonly routes: number;
  readonly airports: number;
  readonly carriers: readonly { readonly code: string; readonly flights: number }[];
}

export interface RouteKey {
  readonly origin: string;
  readonly destination: string;
}

/** The valid flights of an import, one entry per flight in parallel arrays. */
export interface HistoryTable {
  readonly airports: readonly string[];
  /** Routes in order of first appearance; `route` indexes into this. */
  readonly routes: readonly RouteKey[];
  readonly routeOrigin: Int32Array;
  readonly routeDestination: Int32Array;
  readonly length: number;
  /** Days since 1970-01-01. */
  readonly day: Int32Array;
  readonly route: Int32Array;
  /** Arrival delay in whole minutes. */
  readonly arrival: Int16Array;
  /** Departure delay in whole minutes, or NO_DELAY. */
  readonly departure: Int16Array;
  readonly summary: ImportSummary;
}

/** Marks "no departure delay recorded" in HistoryTable.departure. */
export const NO_DELAY = -32768;

const CACHE_LIMIT = 100_000;

const FIELD_INDEX = Object.fromEntries(HISTORY_FIELDS.map((f, i) => [f, i])) as Record<HistoryField, number>;

export interface HistoryTableBuilder {
  /**
   * Adds one row. `cells[i]` is the cell of field HISTORY_FIELDS[i], undefined where the file has
   * no such column. `row` is the row's number for samples.
   */
  add(cells: readonly Cell[], row: number): void;
  /** Counts a row that could not be split into enough fields. */
  addShortRow(row: number, text: string): void;
  /** Rows added so far. */
  readonly rows: number;
  finish(): HistoryTable;
}

class Growable {
  day = new Int32Array(1 << 16);
  route = new Int32Array(1 << 16);
  arrival = new Int16Array(1 << 16);
  departure = new Int16Array(1 << 16);
  length = 0;

  push(day: number, route: number, arrival: number, departure: number): void {
    if (this.length === this.day.length) this.grow();
    const i = this.length++;
    this.day[i] = day;
    this.route[i] = route;
    this.arrival[i] = arrival;
    this.departure[i] = departure;
  }

  private grow(): void {
    const size = this.day.length * 2;
    this.day = grown(this.day, new Int32Array(size));
    this.route = grown(this.route, new Int32Array(size));
    this.arrival = grown(this.arrival, new Int16Array(size));
    this.departure = grown(this.departure, new Int16Array(size));
  }
}

function grown<T extends Int32Array | Int16Array>(old: T, next: T): T {
  next.set(old);
  return next;
}

function cellText(cell: Cell): string {
  if (cell === null || cell === undefined) return '';
  if (cell instanceof Date) return Number.isFinite(cell.getTime()) ? cell.toISOString() : 'Invalid Date';
  const text = String(cell);
  return text.length > 80 ? text.slice(0, 80) + '…' : text;
}

/** A builder that validates and stores rows; see HistoryTableBuilder. */
export function createHistoryTableBuilder(): HistoryTableBuilder {
  const store = new Growable();
  const airportIndex = new Map<string, number>();
  const airports: string[] = [];
  const routeIndex = new Map<string, Map<string, number>>();
  const routes: RouteKey[] = [];
  const routeOrigin: number[] = [];
  const routeDestination: number[] = [];
  const invalidCounts = new Map<InvalidReason, number>();
  const samples = new Map<InvalidReason, InvalidSample[]>();
  const carriers = new Map<string, number>();
  let rows = 0;
  let cancelled = 0;
  let diverted = 0;
  let divertedDepartures = 0;
  let departureDelays = 0;
  let roundedDelays = 0;
  let firstDay = Infinity;
  let lastDay = -Infinity;

  function reject(reason: InvalidReason, row: number, cells: readonly Cell[] | null, text?: string): void {
    invalidCounts.set(reason, (invalidCounts.get(reason) ?? 0) + 1);
    let list = samples.get(reason);
    if (!list) samples.set(reason, (list = []));
    if (list.length >= SAMPLES_PER_REASON) return;
    const shown: Partial<Record<HistoryField, string>> = {};
    if (cells) {
      HISTORY_FIELDS.forEach((f, i) => {
        if (cells[i] !== undefined) shown[f] = cellText(cells[i]);
      });
    } else if (text !== undefined) {
      shown.date = text.length > 80 ? text.slice(0, 80) + '…' : text;
    }
    list.push({ row, cells: shown });
  }

  function airport(code: string): number {
    let i = airportIndex.get(code);
    if (i === undefined) {
      i = airports.length;
      airports.push(code);
      airportIndex.set(code, i);
    }
    return i;
  }

  function routeOf(origin: string, destination: string): number {
    let inner = routeIndex.get(origin);
    if (!inner) routeIndex.set(origin, (inner = new Map()));
    let r = inner.get(destination);
    if (r === undefined) {
      r = routes.length;
      routes.push({ origin, destination });
      routeOrigin.push(airport(origin));
      routeDestination.push(airport(destination));
      inner.set(destination, r);
    }
    return r;
  }

  // Returns the delay in whole minutes, or a reason string when it is unusable.
  function delayMinutes(cell: Cell, bad: InvalidReason, implausible: InvalidReason): number | InvalidReason {
    const value = parseNumberCell(cell);
    if (Number.isNaN(value)) return bad;
    const minutes = Math.round(value);
    if (minutes < MIN_DELAY || minutes >= MAX_DELAY_EXCLUSIVE) return implausible;
    if (minutes !== value) roundedDelays++;
    return minutes;
  }

  // Files repeat a few hundred dates and airports millions of times: parse each text once.
  // The caches are bounded so a hostile file of all-distinct values cannot grow them without end.
  const dateCache = new Map<string, number>();
  const airportCache = new Map<string, string>();
  function cached<T>(cache: Map<string, T>, cell: Cell, parse: (cell: Cell) => T): T {
    if (typeof cell !== 'string') return parse(cell);
    let value = cache.get(cell);
    if (value === undefined) {
      value = parse(cell);
      if (cache.size >= CACHE_LIMIT) cache.clear();
      cache.set(cell, value);
    }
    return value;
  }
  const cachedDate = (cell: Cell): number => cached(dateCache, cell, parseFlightDate);
  const cachedAirport = (cell: Cell): string => cached(airportCache, cell, parseAirportCode);

  function add(cells: readonly Cell[], row: number): void {
    rows++;
    const dateCell = cells[FIELD_INDEX.date];
    if (isEmptyCell(dateCell)) return reject('missing-date', row, cells);
    const day = cachedDate(dateCell);
    if (Number.isNaN(day)) return reject('bad-date', row, cells);
    const origin = cachedAirport(cells[FIELD_INDEX.origin]);
    if (!origin) return reject('bad-origin', row, cells);
    const destination = cachedAirport(cells[FIELD_INDEX.destination]);
    if (!destination) return reject('bad-destination', row, cells);
    if (origin === destination) return reject('same-origin-and-destination', row, cells);
    const cancelledCell = cells[FIELD_INDEX.cancelled];
    const isCancelled = isEmptyCell(cancelledCell) ? 0 : parseFlag(cancelledCell);
    if (Number.isNaN(isCancelled)) return reject('bad-cancelled-flag', row, cells);
    const divertedCell = cells[FIELD_INDEX.diverted];
    const isDiverted = isEmptyCell(divertedCell) ? 0 : parseFlag(divertedCell);
    if (Number.isNaN(isDiverted)) return reject('bad-diverted-flag', row, cells);
    const carrierCell = cells[FIELD_INDEX.carrier];
    let carrier = '';
    if (!isEmptyCell(carrierCell)) {
      carrier = parseCarrierCode(carrierCell);
      if (!carrier) return reject('bad-carrier', row, cells);
    }
    const scheduledCell = cells[FIELD_INDEX.scheduledDeparture];
    if (!isEmptyCell(scheduledCell) && Number.isNaN(parseHhmm(scheduledCell))) return reject('bad-scheduled-departure', row, cells);
    if (isCancelled === 1) {
      cancelled++;
      return;
    }
    const depCell = cells[FIELD_INDEX.departureDelay];
    let departure = NO_DELAY;
    if (!isEmptyCell(depCell)) {
      const d = delayMinutes(depCell, 'bad-departure-delay', 'implausible-departure-delay');
      if (typeof d === 'string') return reject(d, row, cells);
      departure = d;
    }
    if (isDiverted === 1) {
      // A diverted flight never reached its destination, so it has no arrival delay, but it did
      // depart and its departure delay is real. Kept only in the departure data.
      diverted++;
      if (departure !== NO_DELAY) {
        divertedDepartures++;
        push(day, routeOf(origin, destination), NO_DELAY, departure, carrier);
      }
      return;
    }
    const arrCell = cells[FIELD_INDEX.arrivalDelay];
    if (isEmptyCell(arrCell)) return reject('missing-arrival-delay', row, cells);
    const arrival = delayMinutes(arrCell, 'bad-arrival-delay', 'implausible-arrival-delay');
    if (typeof arrival === 'string') return reject(arrival, row, cells);
    push(day, routeOf(origin, destination), arrival, departure, carrier);
  }

  function push(day: number, route: number, arrival: number, departure: number, carrier: string): void {
    if (departure !== NO_DELAY) departureDelays++;
    if (carrier) carriers.set(carrier, (carriers.get(carrier) ?? 0) + 1);
    if (day < firstDay) firstDay = day;
    if (day > lastDay) lastDay = day;
    store.push(day, route, arrival, departure);
  }

  function finish(): HistoryTable {
    const n = store.length;
    let invalid = 0;
    for (const c of invalidCounts.values()) invalid += c;
    let flights = 0;
    for (let i = 0; i < n; i++) if (store.arrival[i] !== NO_DELAY) flights++;
    const summary: ImportSummary = {
      rows,
      flights,
      departureDelays: departureDelays - divertedDepartures,
      divertedDepartures,
      cancelled,
      diverted,
      invalid,
      invalidByReason: INVALID_REASONS.filter((r) => invalidCounts.has(r)).map((reason) => ({
        reason,
        label: INVALID_REASON_LABELS[reason],
        count: invalidCounts.get(reason) ?? 0,
        samples: samples.get(reason) ?? [],
      })),
      roundedDelays,
      firstDate: n > 0 ? formatDay(firstDay) : null,
      lastDate: n > 0 ? formatDay(lastDay) : null,
      routes: routes.length,
      airports: airports.length,
      carriers: [...carriers.entries()].sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1)).map(([code, count]) => ({ code, flights: count })),
    };
    return {
      airports,
      routes,
      routeOrigin: Int32Array.from(routeOrigin),
      routeDestination: Int32Array.from(routeDestination),
      length: n,
      day: store.day.slice(0, n),
      route: store.route.slice(0, n),
      arrival: store.arrival.slice(0, n),
      departure: store.departure.slice(0, n),
      summary,
    };
  }

  return {
    add,
    addShortRow(row, text) {
      rows++;
      reject('too-few-fields', row, null, text);
    },
    get rows() {
      return rows;
    },
    finish,
  };
}
