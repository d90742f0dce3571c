// The held-out split of an imported history by date, and the conversion of its flights into
// the column layout the fitting pipeline reads (FlightColumns), one delay kind at a time.
import { dayNumber, dayToDate, daysInMonth, formatDay } from './cells';
import type { FlightColumns } from '../delay/evaluation/flight-columns';
import type { DelayKind } from '../delay/predictive';
import { NO_DELAY, type HistoryTable } from './history-table';

export class HoldoutError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'HoldoutError';
  }
}

/**
 * Parses a --holdout-after value, YYYY-MM-DD, to a day number. Throws HoldoutError for
 * anything else, including impossible dates such as 2024-02-30.
 */
export function parseHoldoutAfter(text: string): number {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text.trim());
  const day = m ? dayNumber(Number(m[1]), Number(m[2]), Number(m[3])) : NaN;
  if (Number.isNaN(day)) throw new HoldoutError(`--holdout-after needs a date written YYYY-MM-DD, got '${text}'`);
  return day;
}

/**
 * The default split: hold out the last month of data. When the latest flight is on the last
 * day of its month, that is exactly its calendar month; otherwise the flights after the same
 * day of the previous month (clamped to that month's length).
 * @example formatDay(defaultHoldoutAfter(dayNumber(2024, 6, 30))) // returns '2024-05-31'
 */
export function defaultHoldoutAfter(lastDay: number): number {
  const { year, month, day } = dayToDate(lastDay);
  const prevYear = month === 1 ? year - 1 : year;
  const prevMonth = month === 1 ? 12 : month - 1;
  const prevLength = daysInMonth(prevYear, prevMonth);
  if (day === daysInMonth(year, month)) return dayNumber(prevYear, prevMonth, prevLength);
  return dayNumber(prevYear, prevMonth, Math.min(day, prevLength));
}

export interface HoldoutPlan {
  /** Flights dated after this day number are held out. */
  readonly cutoffDay: number;
  /** The same, YYYY-MM-DD. */
  readonly holdoutAfter: string;
  /** True when the cutoff is the default "last month of data". */
  readonly defaulted: boolean;
  readonly fitFlights: number;
  readonly heldOutFlights: number;
}

/**
 * Chooses the cutoff (the caller's, else the default) and checks that both sides hold flights
 * with an arrival delay; throws HoldoutError naming the data's date range otherwise.
 */
export function planHoldout(table: HistoryTable, cutoffDay?: number): HoldoutPlan {
  if (table.summary.flights === 0) throw new HoldoutError('the file holds no usable flights with an arrival delay');
  let last = -Infinity;
  for (let i = 0; i < table.length; i++) if (table.day[i]! > last) last = table.day[i]!;
  const cutoff = cutoffDay ?? defaultHoldoutAfter(last);
  let fitFlights = 0;
  let heldOutFlights = 0;
  for (let i = 0; i < table.length; i++) {
    if (table.arrival[i] === NO_DELAY) continue;
    if (table.day[i]! <= cutoff) fitFlights++;
    else heldOutFlights++;
  }
  const range = `${table.summary.firstDate} to ${table.summary.lastDate}`;
  if (fitFlights === 0) throw new HoldoutError(`no flights are dated on or before ${formatDay(cutoff)} (the data runs ${range}), so nothing is left to fit; choose a later --holdout-after`);
  if (heldOutFlights === 0) throw new HoldoutError(`no flights are dated after ${formatDay(cutoff)} (the data runs ${range}), so nothing is held out; choose an earlier --holdout-after`);
  return { cutoffDay: cutoff, holdoutAfter: formatDay(cutoff), defaulted: cutoffDay === undefined, fitFlights, heldOutFlights };
}

/** True when the table holds departure delays, so departure posteriors can be fitted directly. */
export function hasDepartureDelays(table: HistoryTable): boolean {
  return table.summary.departureDelays + table.summary.divertedDepartures > 0;
}

/**
 * The table's flights as FlightColumns for one delay kind: delayMinutes is that kind's delay,
 * NaN where the flight has none (a diverted flight's arrival, a missing departure delay).
 */
export function historyFlightColumns(table: HistoryTable, kind: DelayKind): FlightColumns {
  if (table.airports.length > 65_535) throw new RangeError('more airports than FlightColumns can index');
  const n = table.length;
  const origin = new Uint16Array(n);
  const destination = new Uint16Array(n);
  const delayMinutes = new Float64Array(n);
  const source = kind === 'arrival' ? table.arrival : table.departure;
  for (let i = 0; i < n; i++) {
    const r = table.route[i]!;
    origin[i] = table.routeOrigin[r]!;
    destination[i] = table.routeDestination[r]!;
    const d = source[i]!;
    delayMinutes[i] = d === NO_DELAY ? NaN : d;
  }
  return { length: n, airports: table.airports, origin, destination, day: table.day, delayMinutes };
}
