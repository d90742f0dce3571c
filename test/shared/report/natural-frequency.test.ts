import { describe, expect, it } from 'vitest';
import { missFrequency, naturalFrequency, roundOutOf } from '../../../shared/report/natural-frequency';

describe('naturalFrequency', () => {
  it.each([
    [1 / 12, 'about 1 in 12'],
    [0.2, 'about 1 in 5'],
    [0.25, 'about 1 in 4'],
    [0.31, 'about 3 in 10'],
    [0.5, 'about 5 in 10'],
    [0.9, 'about 9 in 10'],
    [0.95, 'about 19 in 20'],
    [0.98, 'about 49 in 50'],
    [1 / 37, 'about 1 in 35'],
    [1 / 430, 'about 1 in 450'],
    [0.0004, 'fewer than 1 in 1,000'],
    [0, 'fewer than 1 in 1,000'],
    [0.9996, 'more than 999 in 1,000'],
    [1, 'more than 999 in 1,000'],
  ])('writes %f as "%s"', (p, text) => {
    expect(naturalFrequency(p).text).toBe(text);
  });

  it('never strays from the probability by more than its rounding step', () => {
    // The phrase must stay faithful to the number: within 1 part in 20 on the tens scale,
    // and within 10% (or half a unit for small N) on the "1 in N" scale.
    for (let p = 0.001; p < 0.999; p += 0.0007) {
      const f = naturalFrequency(p);
      const implied = f.count / f.outOf;
      if (f.outOf === 10) expect(Math.abs(implied - p)).toBeLessThanOrEqual(0.05 + 1e-12);
      else if (f.count === 1) expect(Math.abs(f.outOf * p - 1)).toBeLessThanOrEqual(Math.max(0.1, p / 2) + 1e-9);
      else expect(Math.abs(f.outOf * (1 - p) - 1)).toBeLessThanOrEqual(Math.max(0.1, (1 - p) / 2) + 1e-9);
    }
  });

  it('rejects NaN and values outside [0, 1]', () => {
    expect(() => naturalFrequency(Number.NaN)).toThrow(RangeError);
    expect(() => naturalFrequency(-0.1)).toThrow(/\[0, 1\]/);
    expect(() => naturalFrequency(1.2)).toThrow(RangeError);
  });
});

describe('missFrequency', () => {
  it('states how often a connection is missed from its chance of being made', () => {
    expect(missFrequency(11 / 12)).toBe('about 1 in 12');
    expect(missFrequency(0.8)).toBe('about 1 in 5');
  });
});

describe('roundOutOf', () => {
  it('keeps small denominators exact and rounds large ones to coarser steps', () => {
    expect(roundOutOf(7.4)).toBe(7);
    expect(roundOutOf(23)).toBe(23);
    expect(roundOutOf(37)).toBe(35);
    expect(roundOutOf(77)).toBe(75);
    expect(roundOutOf(260)).toBe(250);
    expect(roundOutOf(137)).toBe(140);
    expect(roundOutOf(0.3)).toBe(1);
  });
});
