// Plain-text renderings of scored trips: a terminal table and a CSV with one row per connection.
//
// Both carry the caution that these are estimates from historical data, not guarantees, and
// that airline rules decide. JSON is the caller's job (it extends the `layline parse` shape).
import type { ScoredConnection, ScoredTrip, ScoredTrips } from './types';

export function percent(p: number | null, digits = 1): string {
  if (p === null || Number.isNaN(p)) return '-';
  const v = p * 100;
  // Never print 100.0% or 0.0% for something that is merely close.
  if (v > 100 - 0.5 * 10 ** -digits && p < 1) return `>${(100 - 10 ** -digits).toFixed(digits)}%`;
  if (v < 0.5 * 10 ** -digits && p > 0) return `<${(10 ** -digits).toFixed(digits)}%`;
  return `${v.toFixed(digits)}%`;
}

function signedMinutes(m: number | null): string {
  if (m === null || Number.isNaN(m)) return '-';
  const r = Math.round(m);
  return r > 0 ? `+${r}` : `${r}`;
}

function interval(iv: readonly [number, number] | null): string {
  return iv ? `${percent(iv[0])} to ${percent(iv[1])}` : '-';
}

function table(rows: readonly (readonly string[])[], rightAligned: ReadonlySet<number>): string[] {
  const widths: number[] = [];
  for (const row of rows) row.forEach((cell, i) => (widths[i] = Math.max(widths[i] ?? 0, cell.length)));
  return rows.map((row) =>
    row
      .map((cell, i) => (rightAligned.has(i) ? cell.padStart(widths[i] ?? 0) : cell.padEnd(widths[i] ?? 0)))
      .join('  ')
      .trimEnd(),
  );
}

function tripTitle(trip: ScoredTrip): string {
  const who = [trip.traveler || '(no traveller)', trip.trip || '(no trip name)', trip.option ? `option ${trip.option}` : ''].filter(Boolean).join(' / ');
  const route = [trip.legs[0]?.from ?? '', ...trip.legs.map((l) => l.to)].join(' > ');
  const ranking = trip.optionCount > 1 ? `   rank ${trip.optionRank} of ${trip.optionCount}${trip.paretoOptimal ? ', Pareto-optimal' : ''}` : '';
  return `${who}   ${route}${ranking}`;
}

function connectionRow(c: ScoredConnection): string[] {
  return [
    c.airport === c.departAirport ? c.airport : `${c.airport}>${c.departAirport}`,
    `${c.inboundFlight} > ${c.outboundFlight}`,
    String(c.layoverMinutes),
    String(c.mctMinutes),
    percent(c.pMake),
    interval(c.pMakeInterval),
    c.minLayoverMinutes === null ? (c.scored ? 'none' : '-') : String(c.minLayoverMinutes),
    signedMinutes(c.marginMinutes),
    c.flags.join(' '),
  ];
}

/** The terminal table: one block per trip, then the group and the caution. */
export function formatScoreTable(scored: ScoredTrips): string {
  const level = Math.round(scored.intervalLevel * 100);
  const out: string[] = [];
  out.push(`Connection risk: target P(make) ${percent(scored.target, 0)}, ${level}% credible intervals, posteriors ${scored.bundle.id} (${scored.bundle.model}), seed ${scored.seed}, ${scored.simulations} simulations`);
  out.push('');
  for (const trip of scored.trips) {
    out.push(tripTitle(trip));
    const deadline = trip.pArriveByDeadline === null ? '' : `   P(arrive by ${(trip.deadlineLocal ?? '').replace('T', ' ')} local) ${percent(trip.pArriveByDeadline)}`;
    out.push(
      `  P(all connections) ${percent(trip.pAllConnections)} (${interval(trip.pAllConnectionsInterval)})   arrival delay: expected ${signedMinutes(trip.expectedArrivalDelayMinutes)} min, median ${signedMinutes(trip.arrivalDelayQuantilesMinutes.p50)}, 90% by ${signedMinutes(trip.arrivalDelayQuantilesMinutes.p90)}${deadline}`,
    );
    if (trip.connections.length === 0) out.push('  (no connections: a single flight)');
    else {
      const rows = [['  at', 'flights', 'layover', 'MCT', 'P(make)', `${level}% interval`, 'min layover', 'margin', 'flags'], ...trip.connections.map((c) => ['  ' + (connectionRow(c)[0] ?? ''), ...connectionRow(c).slice(1)])];
      out.push(...table(rows, new Set([2, 3, 4, 6, 7])));
      // A pooled route shared by two connections would repeat its warning: print each once.
      const seen = new Set<string>();
      for (const c of trip.connections) {
        for (const w of c.warnings) {
          const line = w.code === 'pooled-route' ? `    ! ${w.message}` : `    ! ${c.airport}: ${w.message}`;
          if (!seen.has(line)) out.push(line);
          seen.add(line);
        }
      }
    }
    out.push('');
  }
  const g = scored.group;
  out.push(`Group: ${g.travelers} traveller${g.travelers === 1 ? '' : 's'} (best-ranked option of each trip)`);
  out.push(`  expected number who miss a connection: ${g.expectedMisconnecting.toFixed(2)} (simulation error +-${g.expectedMisconnectingStdError.toFixed(2)})`);
  out.push(`  P(at least k miss):  ${(['1', '2', '3', '4', '5'] as const).map((k) => `k=${k} ${percent(g.pAtLeast[k])}`).join('   ')}`);
  if (g.topConnections.length) {
    out.push('  connections contributing most:');
    const rows = [['    at', 'flights', 'date', 'travellers', 'P(miss)', 'expected misses'], ...g.topConnections.map((c) => [`    ${c.airport}`, `${c.inboundFlight} > ${c.outboundFlight}`, c.inboundDate, String(c.travelers), percent(c.pMiss), c.expectedMisses.toFixed(2)])];
    out.push(...table(rows, new Set([3, 4, 5])));
  }
  const errors = scored.problems.filter((p) => p.severity === 'error').length;
  if (scored.problems.length) out.push('', `Input problems: ${errors} error${errors === 1 ? '' : 's'}, ${scored.problems.length - errors} warning${scored.problems.length - errors === 1 ? '' : 's'} (see --format json, or layline parse)`);
  out.push('', `Caution: ${scored.caution}`, '');
  return out.join('\n');
}

/** RFC 4180 quoting: quote a cell holding a comma, quote or line break, doubling quotes. */
export function csvCell(value: string | number | null): string {
  const text = value === null ? '' : String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

export const SCORE_CSV_COLUMNS = [
  'trip_id', 'traveler', 'trip', 'option', 'airport', 'depart_airport', 'inbound_flight', 'outbound_flight', 'layover_minutes', 'connection_type',
  'mct_minutes', 'p_make', 'p_make_lo', 'p_make_hi', 'min_layover_minutes', 'margin_minutes', 'flags', 'p_all_connections',
  'expected_arrival_delay_minutes', 'p_arrive_by_deadline', 'option_rank', 'pareto_optimal',
] as const;

/**
 * One row per connection (trips without connections get one row with the connection cells empty).
 * Plain RFC 4180 with no comment lines, so spreadsheets read it as is; the caller shows the caution.
 */
export function formatScoreCsv(scored: ScoredTrips): string {
  const lines = [SCORE_CSV_COLUMNS.join(',')];
  for (const t of scored.trips) {
    const tripCells = [t.pAllConnections, t.expectedArrivalDelayMinutes, t.pArriveByDeadline, t.optionRank, t.paretoOptimal ? 'true' : 'false'];
    const conns: (ScoredConnection | null)[] = t.connections.length ? [...t.connections] : [null];
    for (const c of conns) {
      const cells: (string | number | null)[] = [
        t.id, t.traveler, t.trip, t.option,
        c?.airport ?? null, c?.departAirport ?? null, c?.inboundFlight ?? null, c?.outboundFlight ?? null, c?.layoverMinutes ?? null, c?.connectionType ?? null,
        c?.mctMinutes ?? null, c?.pMake ?? null, c?.pMakeInterval?.[0] ?? null, c?.pMakeInterval?.[1] ?? null, c?.minLayoverMinutes ?? null, c?.marginMinutes ?? null,
        c ? c.flags.join(' ') : null,
        ...tripCells,
      ];
      lines.push(cells.map(csvCell).join(','));
    }
  }
  return lines.join('\n') + '\n';
}
