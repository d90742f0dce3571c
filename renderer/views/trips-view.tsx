// Trips and connections: one group of rows per trip, filter and sort controls, arrow-key
// navigation between rows, and the selected connection's detail beside the table.
import type { ComponentChildren } from 'preact';
import { useEffect, useMemo, useRef, useState } from 'preact/hooks';
import type { Analysis, ConnectionView, TripView } from '../../shared/api/analysis-schema';
import { clock, dayMarker, duration, localDay, signedMinutes } from '../app/format';
import { airportsOf, filterTrips, flagWords, SORT_LABELS, sortTrips, type SortKey, type TripFilter } from '../state/trip-table';
import { ProbabilityText, RiskGauge } from './risk-gauge';

/**
 * Trips drawn at first and added per step as the list scrolls: a long paste shows its first
 * screens at once instead of building every row before anything appears.
 */
export const TRIPS_PER_STEP = 60;

export interface Selection {
  readonly tripId: string;
  readonly connectionIndex: number;
}

export interface TripsViewProps {
  readonly analysis: Analysis;
  readonly filter: TripFilter;
  readonly sort: SortKey;
  readonly target: number;
  readonly selection: Selection | null;
  readonly onFilter: (patch: Partial<TripFilter>, coalesceKey: string | null) => void;
  readonly onSort: (sort: SortKey) => void;
  readonly onSelect: (selection: Selection | null) => void;
  /** The detail panel for the selected connection, rendered beside the table. */
  readonly detail: ComponentChildren;
}

function rowKey(tripId: string, connectionIndex: number | null): string {
  return connectionIndex === null ? `t:${tripId}` : `c:${tripId}:${connectionIndex}`;
}

function LegsCell({ trip }: { trip: TripView }) {
  return (
    <ol class="legs">
      {trip.legs.map((leg, i) => (
        <li key={i}>
          <span class="leg-flight">{leg.flight}</span> <span class="leg-day">{localDay(leg.departLocal)}</span> {leg.from} <time>{clock(leg.departLocal)}</time> <abbr class="zone">{leg.departZoneAbbr}</abbr> → {leg.to}{' '}
          <time>{clock(leg.arriveLocal)}</time>
          {leg.arriveDayOffset !== 0 && (
            <sup class="day-change" title="arrives on a different local date">
              {dayMarker(leg.arriveDayOffset)}
            </sup>
          )}{' '}
          <abbr class="zone">{leg.arriveZoneAbbr}</abbr>
          {leg.booking && <span class="booking"> · {leg.booking}</span>}
        </li>
      ))}
    </ol>
  );
}

function ConnectionCells({ trip, c, target }: { trip: TripView; c: ConnectionView; target: number }) {
  const outbound = trip.legs[c.inboundLeg + 1];
  return (
    <>
      <td>
        <RiskGauge p={c.pMake} lo={c.pMakeLo} hi={c.pMakeHi} target={target} />
      </td>
      <td class="where">
        ↳ at <strong>{c.airport}</strong>
        {c.departAirport !== c.airport && <> to {c.departAirport}</>}
        {outbound && <span class="muted"> onto {outbound.flight}</span>}
      </td>
      <td class="num">{duration(c.layoverMinutes)}</td>
      <td class="num">{c.mctMinutes === null ? '—' : duration(c.mctMinutes)}</td>
      <td class="num">
        <ProbabilityText p={c.pMake} lo={c.pMakeLo} hi={c.pMakeHi} />
      </td>
      <td class="num" data-col="min-layover">
        {c.minLayoverMinutes === null ? (c.pMake === null ? '—' : 'out of reach') : duration(c.minLayoverMinutes)}
      </td>
      <td class={`num ${c.marginMinutes !== null && c.marginMinutes < 0 ? 'short' : ''}`}>{signedMinutes(c.marginMinutes)}</td>
      <td class="flags">{c.flags.length ? c.flags.map(flagWords).join('; ') : c.unscoredReason ?? ''}</td>
    </>
  );
}

export function TripsView({ analysis, filter, sort, target, selection, onFilter, onSort, onSelect, detail }: TripsViewProps) {
  const shown = useMemo(() => sortTrips(filterTrips(analysis.trips, filter, target), sort), [analysis, filter, sort, target]);
  const airports = useMemo(() => airportsOf(analysis.trips), [analysis]);
  const [limit, setLimit] = useState(TRIPS_PER_STEP);
  useEffect(() => setLimit(TRIPS_PER_STEP), [filter, sort]);
  // A selection made elsewhere (the group screen) must be drawn to be seen.
  const selectedAt = selection ? shown.findIndex((t) => t.id === selection.tripId) : -1;
  const drawnCount = Math.max(limit, selectedAt + 1);
  const drawn = useMemo(() => shown.slice(0, drawnCount), [shown, drawnCount]);
  const rows = useMemo(() => drawn.flatMap((t) => [rowKey(t.id, null), ...t.connections.map((c) => rowKey(t.id, c.index))]), [drawn]);
  const table = useRef<HTMLTableElement>(null);
  const sentinel = useRef<HTMLDivElement>(null);
  useEffect(() => {
    const el = sentinel.current;
    if (!el || drawnCount >= shown.length) return undefined;
    const observer = new IntersectionObserver((entries) => {
      if (entries.some((e) => e.isIntersecting)) setLimit((n) => n + TRIPS_PER_STEP);
    });
    observer.observe(el);
    return () => observer.disconnect();
  }, [drawnCount, shown.length]);
  const activeKey = selection ? rowKey(selection.tripId, selection.connectionIndex) : rows[0] ?? null;

  const focusRow = (key: string) => {
    const el = table.current?.querySelector<HTMLElement>(`[data-row="${CSS.escape(key)}"]`);
    el?.focus();
  };

  const selectKey = (key: string) => {
    const [kind, tripId, index] = key.split(':');
    if (!tripId) return;
    const trip = shown.find((t) => t.id === tripId);
    if (kind === 'c') onSelect({ tripId, connectionIndex: Number(index) });
    else if (trip && trip.connections.length) onSelect({ tripId, connectionIndex: trip.connections[0]?.index ?? 0 });
  };

  const onKeyDown = (e: KeyboardEvent, key: string) => {
    const at = rows.indexOf(key);
    const go = (i: number) => {
      const next = rows[Math.min(rows.length - 1, Math.max(0, i))];
      if (next) focusRow(next);
    };
    if (e.key === 'ArrowDown') {
      if (at === rows.length - 1 && drawnCount < shown.length) setLimit(drawnCount + TRIPS_PER_STEP);
      go(at + 1);
    } else if (e.key === 'ArrowUp') go(at - 1);
    else if (e.key === 'Home') go(0);
    else if (e.key === 'End') go(rows.length - 1);
    else if (e.key === 'Enter' || e.key === ' ') selectKey(key);
    else if (e.key === 'Escape') onSelect(null);
    else return;
    e.preventDefault();
  };

  // Keep the selection visible when sorting or filtering moves it.
  useEffect(() => {
    if (selection && !shown.some((t) => t.id === selection.tripId)) onSelect(null);
  }, [shown, selection, onSelect]);

  const intervalPercent = Math.round(analysis.intervalLevel * 100);
  return (
    <section class="trips" aria-labelledby="trips-title">
      <h2 id="trips-title" class="visually-hidden">
        Trips and connections
      </h2>
      <form class="toolbar" role="search" aria-label="Filter and sort trips" onSubmit={(e) => e.preventDefault()}>
        <label>
          Traveler
          <input type="search" value={filter.traveler} placeholder="any" onInput={(e) => onFilter({ traveler: (e.currentTarget as HTMLInputElement).value }, 'filter-traveler')} />
        </label>
        <label>
          Airport
          <select value={filter.airport} onChange={(e) => onFilter({ airport: (e.currentTarget as HTMLSelectElement).value }, null)}>
            <option value="">any</option>
            {airports.map((a) => (
              <option key={a} value={a}>
                {a}
              </option>
            ))}
          </select>
        </label>
        <label class="check">
          <input type="checkbox" checked={filter.shortOnly} onChange={(e) => onFilter({ shortOnly: (e.currentTarget as HTMLInputElement).checked }, null)} />
          Only trips short of the target
        </label>
        <label>
          Sort
          <select value={sort} onChange={(e) => onSort((e.currentTarget as HTMLSelectElement).value as SortKey)}>
            {(Object.keys(SORT_LABELS) as SortKey[]).map((k) => (
              <option key={k} value={k}>
                {SORT_LABELS[k]}
              </option>
            ))}
          </select>
        </label>
        <span role="status" class="muted" data-testid="shown-count">
          {shown.length} of {analysis.trips.length} trips shown
        </span>
      </form>
      <div class={`trips-body${detail ? ' with-detail' : ''}`}>
        <div class="table-wrap">
          <table ref={table} class="trip-table" aria-label="Trips and their connections" data-target={analysis.targetProbability}>
            <thead>
              <tr>
                <th scope="col">Risk</th>
                <th scope="col">Traveler / connection</th>
                <th scope="col">Layover</th>
                <th scope="col">MCT</th>
                <th scope="col">P(make) ({intervalPercent}% interval)</th>
                <th scope="col">Min layover for {Math.round(target * 100)}%</th>
                <th scope="col">Margin</th>
                <th scope="col">Notes</th>
              </tr>
            </thead>
            {drawn.map((trip) => {
              const tripKey = rowKey(trip.id, null);
              return (
                <tbody key={trip.id} aria-label={`Trip of ${trip.traveler}${trip.option ? `, option ${trip.option}` : ''}`} data-trip={trip.id}>
                  <tr class="trip-row" data-row={tripKey} tabIndex={activeKey === tripKey ? 0 : -1} onKeyDown={(e) => onKeyDown(e, tripKey)} onClick={() => selectKey(tripKey)}>
                    <td>{trip.connections.some((c) => c.pMake !== null) ? <RiskGauge p={trip.pAllConnections} lo={trip.pAllLo} hi={trip.pAllHi} target={target} /> : <span class="muted">{trip.connections.length ? 'Not scored' : 'Nonstop'}</span>}</td>
                    <th scope="rowgroup" class="traveler">
                      {trip.traveler}
                      <span class="trip-name">
                        {trip.trip}
                        {trip.option && <> · option {trip.option}</>}
                        {trip.optionCount > 1 && trip.paretoOptimal && <span class="badge"> not beaten</span>}
                      </span>
                    </th>
                    <td colSpan={detail ? 5 : 6}>
                      <LegsCell trip={trip} />
                      <span class="trip-facts">
                        {trip.connections.length > 0 && (
                          <>
                            All connections: <ProbabilityText p={trip.pAllConnections} lo={trip.pAllLo} hi={trip.pAllHi} />
                          </>
                        )}
                        {trip.deadlineLocal && (
                          <>
                            {' '}
                            · Due by {localDay(trip.deadlineLocal)} {clock(trip.deadlineLocal)}
                            {trip.pArriveByDeadline !== null && <>: {Math.round(trip.pArriveByDeadline * 100)}% likely</>}
                          </>
                        )}
                        {trip.expectedArrivalDelayMinutes !== null && <> · Expected arrival delay {duration(trip.expectedArrivalDelayMinutes)}</>}
                      </span>
                    </td>
                  </tr>
                  {trip.connections.map((c) => {
                    const key = rowKey(trip.id, c.index);
                    const selected = selection?.tripId === trip.id && selection.connectionIndex === c.index;
                    return (
                      <tr
                        key={key}
                        class={`connection-row${selected ? ' selected' : ''}`}
                        data-row={key}
                        aria-selected={selected}
                        aria-label={`Connection at ${c.airport} for ${trip.traveler}`}
                        tabIndex={activeKey === key ? 0 : -1}
                        onKeyDown={(e) => onKeyDown(e, key)}
                        onClick={() => onSelect({ tripId: trip.id, connectionIndex: c.index })}
                      >
                        <ConnectionCells trip={trip} c={c} target={target} />
                      </tr>
                    );
                  })}
                </tbody>
              );
            })}
          </table>
          {shown.length === 0 && <p class="empty">No trips match the filter.</p>}
          {drawnCount < shown.length && (
            <div ref={sentinel} class="more">
              <button type="button" onClick={() => setLimit(drawnCount + TRIPS_PER_STEP)}>
                Show more trips ({shown.length - drawnCount} not drawn yet)
              </button>
            </div>
          )}
        </div>
        {detail}
      </div>
    </section>
  );
}
