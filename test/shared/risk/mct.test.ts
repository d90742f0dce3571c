import { describe, expect, it } from 'vitest';
import { connectionType, DEFAULT_MCT_MINUTES, resolveMct } from '../../../shared/risk/mct';
import type { MctRule } from '../../../shared/risk/types';

describe('connectionType', () => {
  it.each<[readonly [string, string, string, string], string]>([
    // [inbound origin, arrival airport, departure airport, outbound destination] countries
    [['US', 'US', 'US', 'US'], 'domestic'],
    [['GB', 'US', 'US', 'US'], 'international-arrival'],
    [['DE', 'GB', 'GB', 'GB'], 'international-arrival'],
    [['DE', 'GB', 'GB', 'US'], 'international'],
    [['GB', 'NL', 'NL', 'JP'], 'international'],
    [['US', 'US', 'US', 'GB'], 'international-departure'],
  ])('classifies %j as %s', (countries, expected) => {
    expect(connectionType(...countries)).toBe(expected);
  });

  it('treats an international connection in the United States as an arrival: no airside transit there (from memory, no source)', () => {
    expect(connectionType('GB', 'US', 'US', 'MX')).toBe('international-arrival');
  });
});

describe('resolveMct', () => {
  // Default values: common practice, no source (as the issue sets them).
  it('uses the defaults: 45 domestic, 60 international, 90 arriving from abroad', () => {
    expect(DEFAULT_MCT_MINUTES.domestic).toBe(45);
    expect(DEFAULT_MCT_MINUTES.international).toBe(60);
    expect(DEFAULT_MCT_MINUTES['international-arrival']).toBe(90);
    expect(resolveMct([], 'ORD', 'ORD', 'domestic')).toEqual({ mctMinutes: 45, transferMinutes: 0, source: 'default' });
  });

  const rules: MctRule[] = [
    { airport: '*', type: 'domestic', minutes: 50, line: 2 },
    { airport: 'ORD', type: 'domestic', minutes: 60, line: 3 },
    { airport: 'ORD', type: 'domestic', minutes: 55, line: 4 },
    { airport: 'JFK', type: 'transfer', minutes: 100, line: 5 },
    { airport: 'JFK', type: 'transfer', departAirport: 'LGA', minutes: 80, line: 6 },
  ];

  it("prefers an airport's own rule over '*', and a later rule over an earlier one", () => {
    expect(resolveMct(rules, 'ORD', 'ORD', 'domestic').mctMinutes).toBe(55);
    expect(resolveMct(rules, 'DEN', 'DEN', 'domestic')).toEqual({ mctMinutes: 50, transferMinutes: 0, source: 'override' });
    expect(resolveMct(rules, 'DEN', 'DEN', 'international').source).toBe('default');
  });

  it('adds the transfer allowance on an airport change, the exact airport pair first', () => {
    expect(resolveMct(rules, 'JFK', 'LGA', 'domestic')).toEqual({ mctMinutes: 50 + 80, transferMinutes: 80, source: 'override' });
    expect(resolveMct(rules, 'JFK', 'EWR', 'domestic').transferMinutes).toBe(100);
    expect(resolveMct([], 'LHR', 'LGW', 'international', 120)).toEqual({ mctMinutes: 180, transferMinutes: 120, source: 'default' });
  });
});
