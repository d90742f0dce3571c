// The plain sentences under the numbers.
import { describe, expect, it } from 'vitest';
import { missSentence, routeDataSentence, targetSentence } from '../../../renderer/app/sentences';
import { duration, percent, signedMinutes } from '../../../renderer/app/format';
import type { ConnectionView } from '../../../shared/api/analysis-schema';

const connection = (patch: Partial<ConnectionView>): ConnectionView => ({
  index: 0,
  airport: 'ORD',
  departAirport: 'ORD',
  inboundLeg: 0,
  layoverMinutes: 45,
  flags: [],
  mctMinutes: 45,
  pMake: 0.875,
  pMakeLo: 0.8,
  pMakeHi: 0.93,
  minLayoverMinutes: 60,
  marginMinutes: -15,
  data: [],
  unscoredReason: null,
  connectionType: 'domestic',
  mctSource: 'default',
  warnings: [],
  ...patch,
});

describe('sentences', () => {
  it('says how many in how many would miss the connection', () => {
    expect(missSentence(0.875)).toBe('About 1 in 8 travelers on this connection would miss it.');
    expect(missSentence(0.9996)).toBe('Fewer than 1 in 1,000 travelers on this connection would miss it.');
    expect(missSentence(0.3)).toBe('About 7 in 10 travelers on this connection would miss it.');
  });

  it('says what the target needs, or what is to spare', () => {
    expect(targetSentence(connection({}), 0.9)).toBe('Reaching the 90% target needs a layover of at least 60 minutes, 15 more than booked.');
    expect(targetSentence(connection({ pMake: 0.95, minLayoverMinutes: 40, marginMinutes: 5 }), 0.9)).toBe('Meets the 90% target with 5 minutes to spare; 40 minutes would be enough.');
    expect(targetSentence(connection({ minLayoverMinutes: null, marginMinutes: null }), 0.99)).toMatch(/No layover within reach/);
  });

  it('names the data behind a route, or that it was pooled', () => {
    expect(routeDataSentence({ origin: 'DFW', destination: 'ORD', kind: 'arrival', pooling: 'route', flights: 12345 })).toBe('Arrivals DFW→ORD: 12,345 flights seen in the data.');
    expect(routeDataSentence({ origin: 'ORD', destination: 'BOS', kind: 'departure', pooling: 'airports', flights: 0 })).toMatch(/pooled from similar routes/);
  });
});

describe('formats', () => {
  it('never prints an estimate as certain', () => {
    expect(percent(0.9999)).toBe('>99%');
    expect(percent(0.001)).toBe('<1%');
    expect(percent(1)).toBe('100%');
    expect(percent(null)).toBe('—');
  });

  it('writes durations and signed margins', () => {
    expect(duration(95)).toBe('1 h 35 min');
    expect(duration(-60)).toBe('−1 h');
    expect(signedMinutes(25)).toBe('+25 min');
    expect(signedMinutes(-10)).toBe('−10 min');
  });
});
