// How numbers, times and durations read on screen, in one place.
import type { LegView } from '../../shared/api/analysis-schema';

export function percent(p: number | null, digits = 0): string {
  if (p === null || !Number.isFinite(p)) return '—';
  const v = p * 100;
  // Never print 100% or 0% for an estimate that is not certain.
  if (v > 99.5 && p < 1) return '>99%';
  if (v < 0.5 && p > 0) return '<1%';
  return `${v.toFixed(digits)}%`;
}

export function percentRange(lo: number | null, hi: number | null): string {
  if (lo === null || hi === null) return '';
  return `${percent(lo)}–${percent(hi)}`;
}

/** 95 → "1 h 35 min"; negative values keep their sign. */
export function duration(minutes: number | null): string {
  if (minutes === null || !Number.isFinite(minutes)) return '—';
  const sign = minutes < 0 ? '−' : '';
  const m = Math.abs(Math.round(minutes));
  if (m < 60) return `${sign}${m} min`;
  const h = Math.floor(m / 60);
  const rest = m % 60;
  return rest ? `${sign}${h} h ${rest} min` : `${sign}${h} h`;
}

/** A margin with an explicit sign: "+25 min" or "−10 min". */
export function signedMinutes(minutes: number | null): string {
  if (minutes === null) return '—';
  return minutes > 0 ? `+${duration(minutes)}` : minutes === 0 ? '0 min' : duration(minutes);
}

/** "2026-03-08T17:35" → "17:35". */
export function clock(local: string): string {
  return local.slice(11, 16);
}

const WEEKDAY = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const MONTH = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/** "2026-03-08T17:35" → "Sun 8 Mar". The date is the airport's own, so no zone conversion. */
export function localDay(local: string): string {
  const y = Number(local.slice(0, 4));
  const mo = Number(local.slice(5, 7)) - 1;
  const d = Number(local.slice(8, 10));
  const weekday = new Date(Date.UTC(y, mo, d)).getUTCDay();
  return `${WEEKDAY[weekday] ?? ''} ${d} ${MONTH[mo] ?? ''}`;
}

export function dayMarker(offset: number): string {
  return offset === 0 ? '' : offset > 0 ? `+${offset}` : `−${-offset}`;
}

export function legSummary(leg: LegView): string {
  return `${leg.flight} ${leg.from} ${clock(leg.departLocal)} ${leg.departZoneAbbr} → ${leg.to} ${clock(leg.arriveLocal)}${dayMarker(leg.arriveDayOffset)} ${leg.arriveZoneAbbr}`;
}

/** "1 trip", "3 trips". */
export function count(n: number, noun: string, plural = `${noun}s`): string {
  return `${n.toLocaleString('en-US')} ${n === 1 ? noun : plural}`;
}
