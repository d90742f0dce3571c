// The normalised shape of pasted or imported trips, shared by parser, risk engine, UI and CLI.
//
// Field names match the JSON that `layline parse` prints. Local times are the airport's
// wall clock as `YYYY-MM-DDTHH:MM`; UTC instants are ISO 8601 with `Z`.

export type Severity = 'error' | 'warning';

export interface Problem {
  /** 1-based line number in the input; 0 for the input as a whole. */
  readonly line: number;
  readonly severity: Severity;
  /** Stable machine-readable code, e.g. 'unknown-airport', 'dst-gap'. */
  readonly code: string;
  readonly message: string;
  /** The original input line (for .ics: the event's first line), kept so the user can correct it. */
  readonly text?: string;
}

export interface Leg {
  readonly flight: string;
  readonly from: string;
  readonly to: string;
  readonly departLocal: string;
  readonly arriveLocal: string;
  readonly departUtc: string;
  readonly arriveUtc: string;
  readonly fromZone: string;
  readonly toZone: string;
  /** 1-based input line (for .ics: the line where the event starts). */
  readonly line: number;
  /** Booking or ticket reference; '' when none was given. */
  readonly booking: string;
  readonly departUtcMs: number;
  readonly arriveUtcMs: number;
}

export type ConnectionFlag =
  | 'below-mct'
  | 'airport-change'
  | 'separate-tickets'
  | 'overnight'
  | 'negative-layover'
  | 'dst-change-during-trip'
  | 'stopover';

export interface Connection {
  /** The connecting airport (the inbound leg's arrival airport). */
  readonly airport: string;
  /** The outbound leg's departure airport; differs from `airport` on an airport change. */
  readonly departAirport: string;
  /** Index into the trip's legs of the inbound leg; the outbound leg is the next one. */
  readonly inboundLeg: number;
  readonly layoverMinutes: number;
  readonly flags: readonly ConnectionFlag[];
}

export interface Trip {
  /** Stable id from traveler, trip and option. */
  readonly id: string;
  readonly traveler: string;
  readonly trip: string;
  readonly option: string;
  readonly legs: readonly Leg[];
  /** Consecutive leg pairs; stopovers (gaps over 24 h) are listed with the 'stopover' flag. */
  readonly connections: readonly Connection[];
  /** Local "must arrive by" time at the final destination, or null. */
  readonly deadlineLocal: string | null;
  readonly deadlineUtc: string | null;
}

export interface ParsedTrips {
  readonly format: 'csv' | 'tsv' | 'text' | 'ics' | 'empty';
  readonly trips: readonly Trip[];
  readonly problems: readonly Problem[];
  /**
   * Lines read as context rather than as legs: a table's header, a date or "Passenger:" line in
   * free text, the continuation of a quoted multi-line cell, the structure of a calendar file.
   * Every non-blank input line is a leg's line, a problem's line, or one of these.
   */
  readonly contextLines?: readonly number[];
}
