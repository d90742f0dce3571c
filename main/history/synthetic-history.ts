// Writes synthetic delay-history CSV files in the BTS prezipped column layout, drawn from known
// route parameters, for round-trip tests and the history benchmark. Streams to disk in blocks so
// files of millions of rows never sit in memory.
//
// Delays follow the shape of the `route` mixture model: a typical Gumbel component and a wider
// disrupted one, with route locations built from origin and destination effects. The flights
// are invented; the airports are real.
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { gumbelSample } from '../../shared/delay/gumbel';
import { formatDay } from '../../shared/history/cells';
import { createRng, type Rng } from '../../shared/inference/rng';

const AIRPORTS: readonly (readonly [string, string, string, number])[] = [
  ['ORD', 'Chicago, IL', 'IL', 13930],
  ['ATL', 'Atlanta, GA', 'GA', 10397],
  ['DFW', 'Dallas/Fort Worth, TX', 'TX', 11298],
  ['DEN', 'Denver, CO', 'CO', 11292],
  ['LAX', 'Los Angeles, CA', 'CA', 12892],
  ['SFO', 'San Francisco, CA', 'CA', 14771],
  ['SEA', 'Seattle, WA', 'WA', 14747],
  ['JFK', 'New York, NY', 'NY', 12478],
  ['BOS', 'Boston, MA', 'MA', 10721],
  ['PHX', 'Phoenix, AZ', 'AZ', 14107],
  ['LAS', 'Las Vegas, NV', 'NV', 12889],
  ['MSP', 'Minneapolis, MN', 'MN', 13487],
  ['DTW', 'Detroit, MI', 'MI', 11433],
  ['CLT', 'Charlotte, NC', 'NC', 11057],
  ['MCO', 'Orlando, FL', 'FL', 13204],
  ['IAH', 'Houston, TX', 'TX', 12266],
];

const CARRIERS: readonly (readonly [string, number])[] = [
  ['AA', 19805],
  ['DL', 19790],
  ['UA', 19977],
  ['WN', 19393],
];

/** The header of the generated files: a subset of the BTS prezipped layout's columns, in its order. */
export const SYNTHETIC_BTS_HEADER = [
  'Year', 'Quarter', 'Month', 'DayofMonth', 'DayOfWeek', 'FlightDate', 'Reporting_Airline', 'DOT_ID_Reporting_Airline',
  'IATA_CODE_Reporting_Airline', 'Tail_Number', 'Flight_Number_Reporting_Airline', 'OriginAirportID', 'Origin',
  'OriginCityName', 'OriginState', 'DestAirportID', 'Dest', 'DestCityName', 'DestState', 'CRSDepTime', 'DepTime',
  'DepDelay', 'DepDelayMinutes', 'CRSArrTime', 'ArrTime', 'ArrDelay', 'ArrDelayMinutes', 'ArrDel15', 'Cancelled',
  'CancellationCode', 'Diverted', 'Distance',
] as const;

export interface SyntheticRoute {
  readonly origin: string;
  readonly destination: string;
  /** Typical component's Gumbel location and scale, minutes. */
  readonly location: number;
  readonly scale: number;
  /** Share of disrupted flights. */
  readonly disruptedWeight: number;
  /** Disrupted component: Gumbel(location + shift, scale * widen). */
  readonly disruptedShift: number;
  readonly disruptedWiden: number;
  /** Departure delay = arrival delay + this mean offset + Normal(0, 4) noise (schedule padding). */
  readonly departureOffset: number;
}

export interface SyntheticHistoryOptions {
  readonly rows: number;
  readonly seed: number;
  /** First flight date, YYYY-MM-DD (day 0), and the number of days spanned. */
  readonly firstDay: number;
  readonly days: number;
  readonly cancelledShare?: number;
  readonly divertedShare?: number;
  /** Use only the first `airports` airports (2..16); default all. */
  readonly airports?: number;
  /** Share of disrupted flights on every route (default 0.15); 0 gives one Gumbel per route. */
  readonly disruptedWeight?: number;
}

export interface SyntheticHistory {
  readonly routes: readonly SyntheticRoute[];
  readonly written: { readonly flights: number; readonly cancelled: number; readonly diverted: number };
}

/** A draw of the arrival delay of one route (unrounded minutes). */
export function sampleSyntheticDelay(route: SyntheticRoute, rng: Rng): number {
  if (rng.uniform() < route.disruptedWeight) return gumbelSample(rng, route.location + route.disruptedShift, route.scale * route.disruptedWiden);
  return gumbelSample(rng, route.location, route.scale);
}

/** The routes' true parameters for a seed: every ordered pair of the chosen airports. */
export function syntheticRoutes(seed: number, airportCount = AIRPORTS.length, disruptedWeight = 0.15): SyntheticRoute[] {
  const rng = createRng(seed);
  const used = AIRPORTS.slice(0, Math.max(2, Math.min(AIRPORTS.length, airportCount)));
  const originEffect = used.map(() => 4 * rng.normal());
  const destEffect = used.map(() => 3 * rng.normal());
  const routes: SyntheticRoute[] = [];
  used.forEach((o, i) =>
    used.forEach((d, j) => {
      if (i === j) return;
      routes.push({
        origin: o[0],
        destination: d[0],
        location: -4 + originEffect[i]! + destEffect[j]! + 1.5 * rng.normal(),
        scale: 9 * Math.exp(0.15 * rng.normal()),
        disruptedWeight,
        disruptedShift: 25,
        disruptedWiden: 4,
        departureOffset: 6,
      });
    }),
  );
  return routes;
}

function hhmm(minutes: number): string {
  const m = ((Math.round(minutes) % 1440) + 1440) % 1440;
  return String(Math.floor(m / 60) * 100 + (m % 60)).padStart(4, '0');
}

/** Writes `rows` flights to `file` and returns the true parameters behind them. */
export async function writeSyntheticBtsCsv(file: string, options: SyntheticHistoryOptions): Promise<SyntheticHistory> {
  const routes = syntheticRoutes(options.seed, options.airports, options.disruptedWeight);
  const byCode = new Map(AIRPORTS.map((a) => [a[0], a]));
  const rng = createRng(options.seed + 1);
  const out = createWriteStream(file);
  const cancelledShare = options.cancelledShare ?? 0.015;
  const divertedShare = options.divertedShare ?? 0.002;
  let block: string[] = [`${SYNTHETIC_BTS_HEADER.map((h) => `"${h}"`).join(',')},`];
  let flights = 0;
  let cancelled = 0;
  let diverted = 0;
  for (let i = 0; i < options.rows; i++) {
    const route = routes[rng.int(routes.length)]!;
    const day = options.firstDay + rng.int(options.days);
    const date = formatDay(day);
    const [year, month, dom] = [Number(date.slice(0, 4)), Number(date.slice(5, 7)), Number(date.slice(8, 10))];
    const weekday = ((((day + 3) % 7) + 7) % 7) + 1;
    const [carrier, carrierId] = CARRIERS[rng.int(CARRIERS.length)]!;
    const o = byCode.get(route.origin)!;
    const d = byCode.get(route.destination)!;
    const crsDep = 360 + rng.int(960);
    const block_ = 60 + rng.int(300);
    const u = rng.uniform();
    const common = `${year},${Math.ceil(month / 3)},${month},${dom},${weekday},${date},"${carrier}",${carrierId},"${carrier}","N${100 + rng.int(900)}${carrier}","${1 + rng.int(2999)}",${o[3]},"${o[0]}","${o[1]}","${o[2]}",${d[3]},"${d[0]}","${d[1]}","${d[2]}","${hhmm(crsDep)}"`;
    let line: string;
    if (u < cancelledShare) {
      cancelled++;
      line = `${common},"",,,"${hhmm(crsDep + block_)}","",,,,1.00,"${'ABC'[rng.int(3)]}",0.00,${(block_ * 8).toFixed(2)},`;
    } else {
      const arrival = Math.round(sampleSyntheticDelay(route, rng));
      const departure = Math.round(arrival + route.departureOffset + 4 * rng.normal());
      const dep = `"${hhmm(crsDep + departure)}",${departure.toFixed(2)},${Math.max(0, departure).toFixed(2)}`;
      if (u < cancelledShare + divertedShare) {
        diverted++;
        line = `${common},${dep},"${hhmm(crsDep + block_)}","",,,,0.00,"",1.00,${(block_ * 8).toFixed(2)},`;
      } else {
        flights++;
        line = `${common},${dep},"${hhmm(crsDep + block_)}","${hhmm(crsDep + block_ + arrival)}",${arrival.toFixed(2)},${Math.max(0, arrival).toFixed(2)},${arrival >= 15 ? '1.00' : '0.00'},0.00,"",0.00,${(block_ * 8).toFixed(2)},`;
      }
    }
    block.push(line);
    if (block.length >= 4096) {
      if (!out.write(block.join('\n') + '\n')) await once(out, 'drain');
      block = [];
    }
  }
  if (block.length > 0) out.write(block.join('\n') + '\n');
  out.end();
  await once(out, 'finish');
  return { routes, written: { flights, cancelled, diverted } };
}
