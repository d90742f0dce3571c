import { describe, expect, it } from 'vitest';
import { formatMinutes, formatPercent, formatPercentRange, formatSignedMinutes, localDayDifference, localTimeParts, utcOffsetLabel } from '../../../shared/report/format';

describe('formatPercent', () => {
  it('rounds to whole percent and keeps the ends honest', () => {
    expect(formatPercent(0.9234)).toBe('92%');
    expect(formatPercent(0.996)).toBe('>99%');
    expect(formatPercent(1)).toBe('100%');
    expect(formatPercent(0.003)).toBe('<1%');
    expect(formatPercent(0)).toBe('0%');
    expect(formatPercent(Number.NaN)).toBe('n/a');
  });

  it('writes an interval once when both ends round alike', () => {
    expect(formatPercentRange(0.84, 0.951)).toBe('84–95%');
    expect(formatPercentRange(0.996, 0.999)).toBe('>99%');
  });
});

describe('formatMinutes', () => {
  it('writes hours and minutes with a true minus sign', () => {
    expect(formatMinutes(95)).toBe('1 h 35 min');
    expect(formatMinutes(120)).toBe('2 h');
    expect(formatMinutes(45)).toBe('45 min');
    expect(formatMinutes(-20)).toBe('−20 min');
    expect(formatSignedMinutes(15)).toBe('+15 min');
    expect(formatSignedMinutes(-75)).toBe('−1 h 15 min');
  });
});

describe('local times', () => {
  it('derives the UTC offset from the wall clock and the instant (IANA tz: America/New_York is UTC−4 after 8 March 2026)', () => {
    expect(utcOffsetLabel('2026-03-08T03:30', Date.UTC(2026, 2, 8, 7, 30))).toBe('UTC−04:00');
    expect(utcOffsetLabel('2026-07-01T12:00', Date.UTC(2026, 6, 1, 6, 30))).toBe('UTC+05:30');
    expect(utcOffsetLabel('2026-01-10T09:00', Date.UTC(2026, 0, 10, 9, 0))).toBe('UTC+00:00');
  });

  it('shows the weekday, date, clock time and zone (1 March 2026 is a Sunday, per the Gregorian calendar)', () => {
    expect(localTimeParts('2026-03-01T18:40', Date.UTC(2026, 2, 2, 0, 40), 'America/Chicago')).toEqual({
      day: 'Sun 1 Mar 2026',
      time: '18:40',
      zone: 'America/Chicago, UTC−06:00',
    });
  });

  it('counts calendar days between two local dates across a month end', () => {
    expect(localDayDifference('2026-03-31T22:10', '2026-04-01T06:05')).toBe(1);
    expect(localDayDifference('2026-03-31T08:00', '2026-03-31T23:00')).toBe(0);
  });
});
