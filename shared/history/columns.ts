// Which column of a delay-history file holds which field: automatic detection from the
// header (including the U.S. BTS on-time performance download's names) and user overrides.
//
// A mapping names column indexes; readers use it to pull only the needed cells from each row.

export const HISTORY_FIELDS = [
  'date',
  'origin',
  'destination',
  'arrivalDelay',
  'departureDelay',
  'carrier',
  'scheduledDeparture',
  'cancelled',
  'diverted',
] as const;

export type HistoryField = (typeof HISTORY_FIELDS)[number];

export const REQUIRED_HISTORY_FIELDS: readonly HistoryField[] = ['date', 'origin', 'destination', 'arrivalDelay'];

export const HISTORY_FIELD_LABELS: Readonly<Record<HistoryField, string>> = {
  date: 'flight date',
  origin: 'origin airport',
  destination: 'destination airport',
  arrivalDelay: 'arrival delay (minutes)',
  departureDelay: 'departure delay (minutes)',
  carrier: 'carrier',
  scheduledDeparture: 'scheduled departure time (local hhmm)',
  cancelled: 'cancelled flag',
  diverted: 'diverted flag',
};

/** Column index per field; a field absent from the object is not in the file. */
export type HistoryMapping = Partial<Record<HistoryField, number>>;

// Header names recognised per field, normalised (lower case, letters and digits only), in order
// of preference. The first names of each list are the BTS "Reporting Carrier On-Time
// Performance" download's: FlightDate/FL_DATE, Origin, Dest, ArrDelay/ARR_DELAY, DepDelay,
// Reporting_Airline, IATA_CODE_Reporting_Airline, OP_UNIQUE_CARRIER, CRSDepTime/CRS_DEP_TIME,
// Cancelled, Diverted (names as listed in the TranStats field definitions, from memory).
// ArrDelayMinutes and DepDelayMinutes are deliberately absent: BTS sets early flights to 0
// there, which would count every early arrival as exactly on time.
const NAMES: Readonly<Record<HistoryField, readonly string[]>> = {
  date: ['flightdate', 'fldate', 'date', 'flightday', 'departuredate', 'scheduleddate'],
  origin: ['origin', 'originairport', 'originiata', 'originairportcode', 'from', 'departureairport', 'orig'],
  destination: ['dest', 'destination', 'destairport', 'destinationairport', 'destiata', 'destinationairportcode', 'to', 'arrivalairport'],
  arrivalDelay: ['arrdelay', 'arrivaldelay', 'arrivaldelayminutes', 'arrdelaymins', 'delay', 'delayminutes'],
  departureDelay: ['depdelay', 'departuredelay', 'departuredelayminutes', 'depdelaymins'],
  carrier: [
    'iatacodereportingairline',
    'reportingairline',
    'opuniquecarrier',
    'opcarrier',
    'uniquecarrier',
    'iatacodeoperatingairline',
    'operatingairline',
    'mktcarrier',
    'carrier',
    'airline',
  ],
  scheduledDeparture: ['crsdeptime', 'scheduleddeparture', 'scheduleddeparturetime', 'scheduleddeptime', 'std'],
  cancelled: ['cancelled', 'canceled', 'iscancelled', 'iscanceled'],
  diverted: ['diverted', 'isdiverted'],
};

// Names that only the BTS download uses; two of them in a header identify its layout.
const BTS_MARKERS = ['flightdate', 'fldate', 'reportingairline', 'opuniquecarrier', 'crsdeptime', 'arrdelayminutes', 'dotidreportingairline', 'originairportid'];

export function normaliseHeaderName(name: string): string {
  return name.toLowerCase().replace(/[^a-z0-9]/g, '');
}

export interface ColumnDetection {
  readonly header: readonly string[];
  readonly mapping: HistoryMapping;
  /** Required fields no column was found for. */
  readonly missing: readonly HistoryField[];
  /** 'bts' when the header is recognisably the BTS on-time performance layout. */
  readonly layout: 'bts' | 'other';
}

/**
 * Finds each field's column by its header name. The first name in a field's preference list
 * that occurs wins; a column is never given to two fields.
 */
export function detectHistoryColumns(header: readonly string[]): ColumnDetection {
  const normalised = header.map(normaliseHeaderName);
  const taken = new Set<number>();
  const mapping: HistoryMapping = {};
  for (const field of HISTORY_FIELDS) {
    for (const name of NAMES[field]) {
      const index = normalised.findIndex((n, i) => n === name && !taken.has(i));
      if (index >= 0) {
        mapping[field] = index;
        taken.add(index);
        break;
      }
    }
  }
  const markers = BTS_MARKERS.filter((m) => normalised.includes(m)).length;
  return {
    header,
    mapping,
    missing: REQUIRED_HISTORY_FIELDS.filter((f) => mapping[f] === undefined),
    layout: markers >= 2 ? 'bts' : 'other',
  };
}

/** The user's choice per field: a column name from the header, or null for "not in this file". */
export type ColumnOverrides = Partial<Record<HistoryField, string | null>>;

export class ColumnMappingError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'ColumnMappingError';
  }
}

/**
 * The mapping to read with: the detected one with the user's overrides applied. Throws a
 * ColumnMappingError naming the problem when an override names no column of the header, two
 * fields share a column, or a required field has no column.
 */
export function resolveHistoryMapping(header: readonly string[], overrides: ColumnOverrides = {}): HistoryMapping {
  const mapping: HistoryMapping = { ...detectHistoryColumns(header).mapping };
  for (const field of HISTORY_FIELDS) {
    const choice = overrides[field];
    if (choice === undefined) continue;
    if (choice === null) {
      delete mapping[field];
      continue;
    }
    let index = header.indexOf(choice);
    if (index < 0) index = header.map(normaliseHeaderName).indexOf(normaliseHeaderName(choice));
    if (index < 0) throw new ColumnMappingError(`no column named '${choice}' for the ${HISTORY_FIELD_LABELS[field]}; the columns are: ${describeHeader(header)}`);
    for (const other of HISTORY_FIELDS) if (other !== field && mapping[other] === index && overrides[other] === undefined) delete mapping[other];
    mapping[field] = index;
  }
  const seen = new Map<number, HistoryField>();
  for (const field of HISTORY_FIELDS) {
    const index = mapping[field];
    if (index === undefined) continue;
    const other = seen.get(index);
    if (other) throw new ColumnMappingError(`column '${header[index]}' is mapped to both the ${HISTORY_FIELD_LABELS[other]} and the ${HISTORY_FIELD_LABELS[field]}`);
    seen.set(index, field);
  }
  const missing = REQUIRED_HISTORY_FIELDS.filter((f) => mapping[f] === undefined);
  if (missing.length > 0) {
    throw new ColumnMappingError(
      `this file has no column for the ${missing.map((f) => HISTORY_FIELD_LABELS[f]).join(', ')}. ` +
        `Columns found: ${describeHeader(header)}. Name the columns to use (for example --column arrivalDelay=ARR_DELAY).`,
    );
  }
  return mapping;
}

function describeHeader(header: readonly string[]): string {
  const shown = header.slice(0, 30).map((h) => `'${h.length > 40 ? h.slice(0, 40) + '…' : h}'`);
  return shown.join(', ') + (header.length > 30 ? `, … (${header.length} in all)` : '') || '(none)';
}
