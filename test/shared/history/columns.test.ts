import { describe, expect, it } from 'vitest';
import { ColumnMappingError, detectHistoryColumns, resolveHistoryMapping } from '../../../shared/history/columns';

// Header names of the BTS "Reporting Carrier On-Time Performance" download (TranStats), from memory.
const PREZIPPED = ['Year', 'Quarter', 'Month', 'DayofMonth', 'FlightDate', 'Reporting_Airline', 'DOT_ID_Reporting_Airline', 'IATA_CODE_Reporting_Airline', 'OriginAirportID', 'Origin', 'OriginCityName', 'Dest', 'CRSDepTime', 'DepTime', 'DepDelay', 'DepDelayMinutes', 'ArrDelay', 'ArrDelayMinutes', 'Cancelled', 'CancellationCode', 'Diverted', ''];
const FIELD_SELECTION = ['YEAR', 'FL_DATE', 'OP_UNIQUE_CARRIER', 'ORIGIN', 'DEST', 'CRS_DEP_TIME', 'DEP_DELAY', 'ARR_DELAY_MINUTES', 'ARR_DELAY', 'CANCELLED', 'DIVERTED'];

describe('detectHistoryColumns', () => {
  it('recognises every field of the BTS prezipped layout', () => {
    const d = detectHistoryColumns(PREZIPPED);
    expect(d.layout).toBe('bts');
    expect(d.missing).toEqual([]);
    const named = Object.fromEntries(Object.entries(d.mapping).map(([f, i]) => [f, PREZIPPED[i]]));
    expect(named).toEqual({
      date: 'FlightDate',
      origin: 'Origin',
      destination: 'Dest',
      arrivalDelay: 'ArrDelay',
      departureDelay: 'DepDelay',
      carrier: 'IATA_CODE_Reporting_Airline',
      scheduledDeparture: 'CRSDepTime',
      cancelled: 'Cancelled',
      diverted: 'Diverted',
    });
  });

  it('recognises the upper-case field-selection layout and never picks ArrDelayMinutes, which BTS floors at 0', () => {
    const d = detectHistoryColumns(FIELD_SELECTION);
    expect(d.layout).toBe('bts');
    expect(FIELD_SELECTION[d.mapping.arrivalDelay!]).toBe('ARR_DELAY');
    expect(FIELD_SELECTION[d.mapping.carrier!]).toBe('OP_UNIQUE_CARRIER');
    expect(FIELD_SELECTION[d.mapping.date!]).toBe('FL_DATE');
  });

  it('reads the on-time sample layout of vega-datasets (date, delay, origin, destination)', () => {
    const d = detectHistoryColumns(['date', 'delay', 'distance', 'origin', 'destination']);
    expect(d.layout).toBe('other');
    expect(d.mapping).toEqual({ date: 0, arrivalDelay: 1, origin: 3, destination: 4 });
  });

  it('lists the required fields it could not find', () => {
    expect(detectHistoryColumns(['when', 'from', 'to']).missing).toEqual(['date', 'arrivalDelay']);
  });
});

describe('resolveHistoryMapping', () => {
  it('applies overrides by name, and null removes a field', () => {
    const header = ['when', 'from', 'to', 'late_by', 'Diverted'];
    const m = resolveHistoryMapping(header, { date: 'when', arrivalDelay: 'late_by', diverted: null });
    expect(m).toEqual({ date: 0, origin: 1, destination: 2, arrivalDelay: 3 });
  });

  it('moves a column to the field the user chose, away from the one detected', () => {
    const m = resolveHistoryMapping(['FlightDate', 'Origin', 'Dest', 'ArrDelay', 'DepDelay'], { arrivalDelay: 'DepDelay' });
    expect(m.arrivalDelay).toBe(4);
    expect(m.departureDelay).toBeUndefined();
  });

  it('names the missing fields and the columns found', () => {
    expect(() => resolveHistoryMapping(['FlightDate', 'Origin', 'Dest'])).toThrow(ColumnMappingError);
    expect(() => resolveHistoryMapping(['FlightDate', 'Origin', 'Dest'])).toThrow(/no column for the arrival delay \(minutes\).*'FlightDate', 'Origin', 'Dest'/);
  });

  it('rejects an override naming no column, and one column used twice', () => {
    expect(() => resolveHistoryMapping(['FlightDate', 'Origin', 'Dest', 'ArrDelay'], { carrier: 'Airline' })).toThrow(/no column named 'Airline'/);
    expect(() => resolveHistoryMapping(['FlightDate', 'Origin', 'Dest', 'ArrDelay'], { departureDelay: 'ArrDelay', arrivalDelay: 'ArrDelay' })).toThrow(/mapped to both/);
  });
});
