// The connections CSV: one row per connection, with the same fields as each connection in
// the JSON of `layline score` (plus the trip it belongs to and its place in the trip), and
// its exact reverse.
//
// RFC 4180 format (CRLF line ends, quoted fields where needed). Numbers are written as
// JavaScript's shortest round-trip form, the same digits JSON.stringify writes, so a row
// parses back to the identical value. Nested JSON values are flattened: pMakeInterval into
// Lo/Hi, the route evidence into prefixed columns, lists into ';'-separated cells.
import type { DelayKind, PoolingLevel } from '../delay/predictive';
import { CONNECTION_TYPES } from '../risk/mct';
import { csvCell } from '../risk/score-format';
import type { ConnectionType, MctSource, RiskFlag, RiskWarning, RouteEvidence, ScoredConnection, ScoredTrip, ScoredTrips } from '../risk/types';

/** A connection as `layline score --format json` prints it (the leg index is the row's connectionIndex). */
export type ScoredConnectionJson = Omit<ScoredConnection, 'inboundLeg'>;

/** The header, in column order. */
export const CONNECTION_CSV_COLUMNS = [
  'tripId',
  'traveler',
  'trip',
  'option',
  'connectionIndex',
  'airport',
  'departAirport',
  'inboundFlight',
  'outboundFlight',
  'layoverMinutes',
  'connectionType',
  'mctMinutes',
  'mctSource',
  'transferMinutes',
  'scored',
  'pMake',
  'pMakeIntervalLo',
  'pMakeIntervalHi',
  'minLayoverMinutes',
  'marginMinutes',
  'flags',
  'warningCodes',
  'warningMessages',
  ...evidenceColumns('inbound'),
  ...evidenceColumns('outbound'),
] as const;

export type ConnectionCsvColumn = (typeof CONNECTION_CSV_COLUMNS)[number];

function evidenceColumns<P extends 'inbound' | 'outbound'>(prefix: P) {
  return [`${prefix}Origin`, `${prefix}Destination`, `${prefix}Kind`, `${prefix}Pooling`, `${prefix}Flights`, `${prefix}Derived`, `${prefix}DrawsUsed`] as const;
}

/** Separates list items (flags, warning codes) inside one cell. */
const LIST_SEPARATOR = ';';
/** Separates warning messages; a message's own line breaks become spaces. */
const MESSAGE_SEPARATOR = '\n';

/**
 * Guards a text cell against spreadsheet formula injection.
 *
 * OWASP "CSV Injection": a cell starting with = + - @ tab or CR may run as a formula in a
 * spreadsheet; a leading apostrophe makes it plain text. Only free-text columns (names,
 * flight numbers, messages) pass through here, never numbers.
 */
function guardText(text: string): string {
  return /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
}

function unguardText(text: string): string {
  return /^'[=+\-@\t\r]/.test(text) ? text.slice(1) : text;
}

const num = (n: number | null): string => (n === null ? '' : String(n));

function evidenceCells(e: RouteEvidence | null): string[] {
  if (!e) return ['', '', '', '', '', '', ''];
  return [e.origin, e.destination, e.kind, e.pooling, String(e.flights), String(e.derived), String(e.drawsUsed)];
}

function rowCells(trip: ScoredTrip, c: ScoredConnection, index: number): string[] {
  return [
    guardText(trip.id),
    guardText(trip.traveler),
    guardText(trip.trip),
    guardText(trip.option),
    String(index),
    c.airport,
    c.departAirport,
    guardText(c.inboundFlight),
    guardText(c.outboundFlight),
    String(c.layoverMinutes),
    c.connectionType,
    String(c.mctMinutes),
    c.mctSource,
    String(c.transferMinutes),
    String(c.scored),
    num(c.pMake),
    num(c.pMakeInterval ? c.pMakeInterval[0] : null),
    num(c.pMakeInterval ? c.pMakeInterval[1] : null),
    num(c.minLayoverMinutes),
    num(c.marginMinutes),
    c.flags.join(LIST_SEPARATOR),
    c.warnings.map((w) => w.code).join(LIST_SEPARATOR),
    guardText(c.warnings.map((w) => w.message.replace(/[\r\n]+/g, ' ')).join(MESSAGE_SEPARATOR)),
    ...evidenceCells(c.inbound),
    ...evidenceCells(c.outbound),
  ];
}

/** The connections of every scored trip as CSV text, header first, CRLF line ends. */
export function connectionsCsv(scored: ScoredTrips): string {
  const lines = [CONNECTION_CSV_COLUMNS.join(',')];
  for (const trip of scored.trips) trip.connections.forEach((c, i) => lines.push(rowCells(trip, c, i).map(csvCell).join(',')));
  return lines.join('\r\n') + '\r\n';
}

const MCT_SOURCES: readonly MctSource[] = ['default', 'override'];
const DELAY_KINDS: readonly DelayKind[] = ['arrival', 'departure'];
const POOLING_LEVELS: readonly PoolingLevel[] = ['route', 'airports', 'population'];

/** One CSV row read back: the trip it belongs to and the connection as `layline score` prints it. */
export interface ConnectionCsvRecord {
  readonly tripId: string;
  readonly traveler: string;
  readonly trip: string;
  readonly option: string;
  readonly connectionIndex: number;
  readonly connection: ScoredConnectionJson;
}

/** Thrown when a row cannot be a connection row; names the column and the value. */
export class ConnectionCsvError extends Error {
  constructor(column: string, value: string) {
    super(`connections CSV: column ${column} has the unreadable value '${value}'`);
    this.name = 'ConnectionCsvError';
  }
}

/**
 * Turns one parsed row (cells keyed by header name, as an RFC 4180 reader gives them) back
 * into the typed record. Throws ConnectionCsvError for a missing column or a malformed value.
 */
export function connectionFromCsvRecord(cells: Readonly<Record<string, string>>): ConnectionCsvRecord {
  const get = (col: ConnectionCsvColumn): string => {
    const v = cells[col];
    if (v === undefined) throw new ConnectionCsvError(col, '(missing)');
    return v;
  };
  const number = (col: ConnectionCsvColumn): number => {
    const v = get(col);
    const n = Number(v);
    if (v.trim() === '' || !Number.isFinite(n)) throw new ConnectionCsvError(col, v);
    return n;
  };
  const nullableNumber = (col: ConnectionCsvColumn): number | null => (get(col) === '' ? null : number(col));
  const bool = (col: ConnectionCsvColumn): boolean => {
    const v = get(col);
    if (v !== 'true' && v !== 'false') throw new ConnectionCsvError(col, v);
    return v === 'true';
  };
  const oneOf = <T extends string>(col: ConnectionCsvColumn, allowed: readonly T[]): T => {
    const v = get(col);
    const hit = allowed.find((a) => a === v);
    if (hit === undefined) throw new ConnectionCsvError(col, v);
    return hit;
  };
  const items = (col: ConnectionCsvColumn): string[] => (get(col) === '' ? [] : get(col).split(LIST_SEPARATOR));
  const evidence = (p: 'inbound' | 'outbound'): RouteEvidence | null => {
    const origin = get(`${p}Origin`);
    if (origin === '') return null;
    return {
      origin,
      destination: get(`${p}Destination`),
      kind: oneOf<DelayKind>(`${p}Kind`, DELAY_KINDS),
      pooling: oneOf<PoolingLevel>(`${p}Pooling`, POOLING_LEVELS),
      flights: number(`${p}Flights`),
      derived: bool(`${p}Derived`),
      drawsUsed: number(`${p}DrawsUsed`),
    };
  };
  const codes = items('warningCodes');
  const messages = get('warningMessages') === '' ? [] : unguardText(get('warningMessages')).split(MESSAGE_SEPARATOR);
  if (codes.length !== messages.length) throw new ConnectionCsvError('warningMessages', get('warningMessages'));
  const warnings: RiskWarning[] = codes.map((code, i) => ({ code, message: messages[i] ?? '' }));
  const lo = nullableNumber('pMakeIntervalLo');
  const hi = nullableNumber('pMakeIntervalHi');
  const connection: ScoredConnectionJson = {
    airport: get('airport'),
    departAirport: get('departAirport'),
    layoverMinutes: number('layoverMinutes'),
    inboundFlight: unguardText(get('inboundFlight')),
    outboundFlight: unguardText(get('outboundFlight')),
    connectionType: oneOf<ConnectionType>('connectionType', CONNECTION_TYPES),
    mctMinutes: number('mctMinutes'),
    mctSource: oneOf<MctSource>('mctSource', MCT_SOURCES),
    transferMinutes: number('transferMinutes'),
    scored: bool('scored'),
    pMake: nullableNumber('pMake'),
    pMakeInterval: lo === null || hi === null ? null : [lo, hi],
    minLayoverMinutes: nullableNumber('minLayoverMinutes'),
    marginMinutes: nullableNumber('marginMinutes'),
    // Flags pass through as written: a code this version does not know is kept, not dropped.
    flags: items('flags') as RiskFlag[],
    warnings,
    inbound: evidence('inbound'),
    outbound: evidence('outbound'),
  };
  return {
    tripId: unguardText(get('tripId')),
    traveler: unguardText(get('traveler')),
    trip: unguardText(get('trip')),
    option: unguardText(get('option')),
    connectionIndex: number('connectionIndex'),
    connection,
  };
}
