// Benchmark of trip intake: parsing and normalising 10,000 legs (issue target: under 200 ms).
//
// The trips are generated from a seeded generator over busy real airports, with flight times
// from great-circle distance, so every leg converts through real zones (and some cross DST).
import { createRng, type Rng } from '../../../shared/inference/rng';
import { parseTrips } from '../../../shared/itinerary/parse-trips';
import { requireAirport, type Airport } from '../../../shared/time/airports';
import { formatWallTime, wallTimeAt } from '../../../shared/time/zones';
import { timeMedian, type BenchRow, type BenchSuite } from '../suite';

const HUBS = 'ATL DFW DEN ORD LAX JFK LAS MCO MIA CLT SEA PHX EWR SFO IAH BOS FLL MSP LGA DTW LHR CDG AMS FRA MAD BCN IST MUC FCO LIS DUB ZRH VIE CPH DXB DOH HND NRT ICN SIN HKG SYD MEL AKL HNL YYZ YVR MEX GRU JNB'.split(' ');

function greatCircleKm(a: Airport, b: Airport): number {
  const rad = Math.PI / 180;
  const dLat = (b.lat - a.lat) * rad;
  const dLon = (b.lon - a.lon) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.lat * rad) * Math.cos(b.lat * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * 6371 * Math.asin(Math.sqrt(h));
}

const pick = <T>(rng: Rng, xs: readonly T[]): T => xs[rng.int(xs.length)] as T;

/** `count` legs as CSV rows, in trips of one to four legs with 45-minute to 5-hour connections. */
export function generateLegsCsv(count: number, seed: number): string {
  const rng = createRng(seed);
  const airports = HUBS.map((c) => requireAirport(c));
  const rows = ['traveler,trip,option,flight,from,depart,to,arrive,booking'];
  let legs = 0;
  for (let t = 0; legs < count; t++) {
    const traveler = `Traveler ${t % 997}`;
    const trip = `Trip ${t}`;
    const option = pick(rng, ['A', 'B', 'C']);
    let at = pick(rng, airports);
    let departUtcMs = Date.UTC(2026, 0, 1) + rng.int(365 * 24 * 60) * 60_000;
    const n = Math.min(1 + rng.int(4), count - legs);
    for (let k = 0; k < n; k++) {
      // Pairs over 18 hours of flying (Melbourne-Dublin) are not flown nonstop; draw again.
      let to = pick(rng, airports);
      while (to === at || greatCircleKm(at, to) > 14_000) to = pick(rng, airports);
      const minutes = Math.round(40 + greatCircleKm(at, to) / 13.5);
      const arriveUtcMs = departUtcMs + minutes * 60_000;
      const dep = wallTimeAt(at.zone, departUtcMs);
      const arr = wallTimeAt(to.zone, arriveUtcMs);
      if (!dep || !arr) break;
      const depText = formatWallTime(dep).replace('T', ' ');
      const dayMark = Math.round((Date.UTC(arr.year, arr.month - 1, arr.day) - Date.UTC(dep.year, dep.month - 1, dep.day)) / 86_400_000);
      const arrText = `${formatWallTime(arr).slice(11)}${dayMark ? (dayMark > 0 ? ` +${dayMark}` : ` ${dayMark}`) : ''}`;
      rows.push([traveler, trip, option, `${pick(rng, ['UA', 'LH', 'BA', 'NH', 'QF', 'AF'])} ${1 + rng.int(2999)}`, at.iata, depText, to.iata, arrText, `PNR${t}`].join(','));
      legs++;
      at = to;
      departUtcMs = arriveUtcMs + (45 + rng.int(255)) * 60_000;
    }
  }
  return rows.join('\n') + '\n';
}

/** The same legs as e-mail lines: a date line whenever the date changes, then the leg. */
function csvToFreeText(csv: string): string {
  const out: string[] = [];
  let lastDate = '';
  for (const row of csv.split('\n').slice(1)) {
    const [, , , flight, from, depart, to, arrive] = row.split(',');
    if (!depart) continue;
    const [date, time] = depart.split(' ');
    if (date !== lastDate) out.push(`Date: ${date}`);
    lastDate = date ?? '';
    out.push(`${flight} ${from} ${time} ${to} ${arrive}`);
  }
  return out.join('\n');
}

export const intakeSuite: BenchSuite = {
  name: 'intake',
  run: async (log) => {
    const rows: BenchRow[] = [];
    // A cold call pays for loading the airport table and the first Intl offset lookups.
    const coldText = generateLegsCsv(10_000, 1);
    const coldStart = performance.now();
    const cold = parseTrips(coldText);
    const coldMs = performance.now() - coldStart;
    const coldLegs = cold.trips.reduce((n, t) => n + t.legs.length, 0);
    log(`cold: ${coldLegs} legs in ${cold.trips.length} trips, ${cold.problems.length} problems, ${coldMs.toFixed(1)} ms`);
    rows.push({ name: 'parse + normalise 10,000 CSV legs, first call', ms: coldMs, notes: `${coldLegs} legs, ${cold.problems.length} problems` });

    // Fresh data each run, so no run repeats the previous one's exact times. CPU time is printed
    // too: on a shared machine it moves less with the load than wall time does.
    const texts = Array.from({ length: 7 }, (_, i) => generateLegsCsv(10_000, 100 + i));
    parseTrips(texts[6] ?? '');
    const wall: number[] = [];
    const cpu: number[] = [];
    for (const t of texts.slice(0, 6)) {
      const c0 = process.cpuUsage();
      const w0 = performance.now();
      parseTrips(t);
      wall.push(performance.now() - w0);
      const c = process.cpuUsage(c0);
      cpu.push((c.user + c.system) / 1000);
    }
    const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)] ?? NaN;
    const sample = parseTrips(texts[0] ?? '');
    const legs = sample.trips.reduce((n, t) => n + t.legs.length, 0);
    rows.push({
      name: 'parse + normalise 10,000 CSV legs',
      ms: median(wall),
      targetMs: 200,
      notes: `${legs} legs, ${sample.trips.length} trips, ${sample.problems.length} problems; median of 6; CPU time median ${median(cpu).toFixed(0)} ms (all threads, GC included)`,
    });

    const tsv = (texts[1] ?? '').replace(/,/g, '\t');
    rows.push({ name: 'parse + normalise 10,000 TSV legs', ms: await timeMedian(() => parseTrips(tsv), 5), notes: 'median of 5' });
    const text = csvToFreeText(texts[2] ?? '');
    const textParsed = parseTrips(text);
    rows.push({
      name: 'parse + normalise 10,000 e-mail lines',
      ms: await timeMedian(() => parseTrips(text), 5),
      notes: `${textParsed.trips.reduce((n, t) => n + t.legs.length, 0)} legs; median of 5`,
    });
    // The generator and the parser must agree, or the figure does not measure real work.
    if (legs < 9_900) log(`WARNING: only ${legs} of 10,000 generated legs were read`);
    return rows;
  },
};
