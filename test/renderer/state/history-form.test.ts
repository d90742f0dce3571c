import { describe, expect, it } from 'vitest';
import { duplicateColumns, formatDuration, formatRelativeError, formatTailPercent, initialChoice, missingRequired, overridesFor } from '../../../renderer/state/history-form';
import { detectHistoryColumns } from '../../../shared/history/columns';

// Column names of the U.S. BTS on-time performance download (its field definitions page).
const BTS_HEADER = ['Year', 'FlightDate', 'Reporting_Airline', 'Origin', 'Dest', 'CRSDepTime', 'DepDelay', 'ArrDelay', 'Cancelled', 'Diverted'];

describe('the column choice', () => {
  it('starts from the detected BTS mapping, by column name', () => {
    const choice = initialChoice({ detection: detectHistoryColumns(BTS_HEADER) });
    expect(choice).toMatchObject({ date: 'FlightDate', origin: 'Origin', destination: 'Dest', arrivalDelay: 'ArrDelay', departureDelay: 'DepDelay', cancelled: 'Cancelled', diverted: 'Diverted' });
    expect(missingRequired(choice)).toEqual([]);
    expect(duplicateColumns(choice)).toEqual([]);
  });

  it('names the required fields left without a column and columns used twice', () => {
    const choice = initialChoice({ detection: detectHistoryColumns(['when', 'leaving', 'reaching', 'late']) });
    expect(missingRequired(choice)).toEqual(['date', 'origin', 'destination', 'arrivalDelay']);
    const edited = { ...choice, date: 'when', origin: 'leaving', destination: 'leaving', arrivalDelay: 'late' };
    expect(missingRequired(edited)).toEqual([]);
    expect(duplicateColumns(edited)).toEqual(['leaving']);
  });

  it('sends every field, so a column the user removed is not detected again', () => {
    const choice = { ...initialChoice({ detection: detectHistoryColumns(BTS_HEADER) }), departureDelay: null };
    expect(overridesFor(choice).departureDelay).toBeNull();
    expect(Object.keys(overridesFor(choice))).toHaveLength(9);
  });
});

describe('formatting', () => {
  it('writes durations for the progress line', () => {
    expect(formatDuration(null)).toBe('—');
    expect(formatDuration(Number.NaN)).toBe('—');
    expect(formatDuration(44_600)).toBe('45 s');
    expect(formatDuration(185_000)).toBe('3 min 05 s');
    expect(formatDuration(3_720_000)).toBe('1 h 02 min');
  });

  it('writes signed relative errors and tail percentages', () => {
    expect(formatRelativeError(-0.128)).toBe('-12.8%');
    expect(formatRelativeError(0.05)).toBe('+5.0%');
    expect(formatRelativeError(null)).toBe('—');
    expect(formatTailPercent(0.2)).toBe('20.0%');
    expect(formatTailPercent(0.0142)).toBe('1.42%');
    expect(formatTailPercent(0.0007)).toBe('0.070%');
  });
});
