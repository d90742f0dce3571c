// Flights held column by column, and the cleaning rule applied before any fit.
//
// Columns (typed arrays, one entry per flight) keep three million flights in a few tens of
// megabytes and let every pass run without allocating per row.

/** Flights as parallel columns; airports are indices into `airports`. */
export interface FlightColumns {
  readonly length: number;
  /** IATA codes; origin[i] and destination[i] index into this list. */
  readonly airports: readonly string[];
  readonly origin: Uint16Array;
  readonly destination: Uint16Array;
  /** Calendar day of the departure, local time, as days since 1970-01-01. */
  readonly day: Int32Array;
  /** Arrival delay in minutes (NaN when missing). */
  readonly delayMinutes: Float64Array;
}

/**
 * The cleaning rule for the on-time sample.
 *
 * - A missing delay is dropped.
 * - A delay below -120 minutes is impossible: no scheduled block time carries two hours of
 *   slack. In the 2001 sample only three rows fall there (-212, -953, -1116 minutes); the
 *   next earliest is -87.
 * - A delay of 1,380 minutes (23 hours) or more is dropped as a day-wrap recording error:
 *   in the sample such rows sit almost all on flights that depart within minutes of
 *   midnight (e.g. PHX-DTW at 23:5x with 1,403-1,447 minutes), which is the signature of a
 *   flight a few minutes early recorded against the next day. A genuinely 23-hour-late
 *   flight is normally cancelled and re-flown, not recorded as a delay.
 * - A departure outside the sample's stated date range is dropped (the sample holds six
 *   rows stamped 2001-07-01 00:00, the end of 30 June's last departures).
 */
export const CLEANING_RULE = {
  minDelayMinutes: -120,
  maxDelayMinutesExclusive: 1380,
  text:
    'Dropped: missing delays; delays below -120 min (impossible, three rows: -212, -953, -1116); ' +
    'delays of 1,380 min (23 h) or more (day-wrap recording errors on flights departing near midnight); ' +
    'departures outside the stated date range.',
} as const;

export interface CleaningReport {
  readonly kept: number;
  readonly droppedMissing: number;
  readonly droppedTooEarly: number;
  readonly droppedTooLate: number;
  readonly droppedOutOfRange: number;
}

/** Day number (days since 1970-01-01) of a calendar date. */
export function dayNumber(year: number, month: number, dayOfMonth: number): number {
  return Math.floor(Date.UTC(year, month - 1, dayOfMonth) / 86_400_000);
}

/** ISO date (YYYY-MM-DD) of a day number. */
export function isoDate(day: number): string {
  return new Date(day * 86_400_000).toISOString().slice(0, 10);
}

/** Calendar month (1-12) of a day number. */
export function monthOfDay(day: number): number {
  return new Date(day * 86_400_000).getUTCMonth() + 1;
}

/**
 * Applies CLEANING_RULE and returns the kept rows as a mask (1 kept, 0 dropped) with counts.
 * firstDay/lastDay bound the stated date range (inclusive day numbers).
 */
export function cleanFlights(flights: FlightColumns, firstDay: number, lastDay: number): { keep: Uint8Array; report: CleaningReport } {
  const keep = new Uint8Array(flights.length);
  let kept = 0;
  let droppedMissing = 0;
  let droppedTooEarly = 0;
  let droppedTooLate = 0;
  let droppedOutOfRange = 0;
  for (let i = 0; i < flights.length; i++) {
    const d = flights.delayMinutes[i]!;
    const day = flights.day[i]!;
    if (Number.isNaN(d)) droppedMissing++;
    else if (d < CLEANING_RULE.minDelayMinutes) droppedTooEarly++;
    else if (d >= CLEANING_RULE.maxDelayMinutesExclusive) droppedTooLate++;
    else if (day < firstDay || day > lastDay) droppedOutOfRange++;
    else {
      keep[i] = 1;
      kept++;
    }
  }
  return { keep, report: { kept, droppedMissing, droppedTooEarly, droppedTooLate, droppedOutOfRange } };
}
