import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { createScoreCommand, scoreCommand } from '../../../main/cli/commands/score';
import { runCli } from '../../../main/cli/run';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';
import { captureIo, type CapturedIo } from './capture-io';

const tripsCsv = readFileSync(new URL('../../fixtures/risk/summit-trips.csv', import.meta.url), 'utf8');

function filesIo(files: Record<string, string>): CapturedIo {
  return captureIo({
    readInput: async (p) => {
      const text = files[p];
      if (text === undefined) throw new Error(`no such file: ${p}`);
      return text;
    },
  });
}

const score = createScoreCommand(async () => syntheticSource());

async function run(args: string[], files: Record<string, string> = { 'trips.csv': tripsCsv }) {
  const io = filesIo(files);
  const code = await runCli(['score', ...args], io, [score]);
  return { code, out: io.out.join(''), err: io.err.join('') };
}

describe('layline score', () => {
  it('prints a terminal table with every trip, the group and the caution', async () => {
    const { code, out } = await run(['trips.csv']);
    expect(code).toBe(0);
    expect(out).toContain('Ana Quill / summit / option A');
    expect(out).toMatch(/P\(all connections\)/);
    expect(out).toMatch(/Group: 2 travellers/);
    expect(out).toContain('not guarantees');
    expect(out).toContain('Airline rules');
  });

  it('extends the parse JSON and gives byte-identical output for the same seed', async () => {
    const first = await run(['trips.csv', '--format', 'json', '--seed', '42']);
    const second = await run(['trips.csv', '--format', 'json', '--seed', '42']);
    expect(first.code).toBe(0);
    expect(first.out).toBe(second.out);
    const json = JSON.parse(first.out);
    expect(json.target).toBe(0.9);
    expect(json.bundle).toEqual({ id: 'synthetic-test', model: 'gumbel (synthetic)', source: 'test/fixtures/risk/synthetic-source.ts' });
    const trip = json.trips[0];
    for (const key of ['id', 'traveler', 'trip', 'option', 'legs', 'connections', 'pAllConnections', 'pAllConnectionsInterval', 'expectedArrivalDelayMinutes', 'pArriveByDeadline', 'paretoOptimal']) {
      expect(trip).toHaveProperty(key);
    }
    expect(trip.legs[0]).toMatchObject({ flight: 'UA100', from: 'ORD', to: 'DEN', departUtc: expect.stringMatching(/Z$/) });
    const c = trip.connections[0];
    for (const key of ['airport', 'layoverMinutes', 'flags', 'mctMinutes', 'pMake', 'pMakeInterval', 'minLayoverMinutes', 'marginMinutes']) expect(c).toHaveProperty(key);
    expect(c.pMakeInterval).toHaveLength(2);
    expect(Object.keys(json.group.pAtLeast)).toEqual(['1', '2', '3', '4', '5']);
    expect(json.group.travelers).toBe(2);
    expect(json.trips[2].pArriveByDeadline).toBeNull();
    expect(json.caution).toContain('not guarantees');
    const other = await run(['trips.csv', '--format', 'json', '--seed', '43']);
    expect(other.out).not.toBe(first.out);
  });

  it('writes CSV with one row per connection and the caution on stderr', async () => {
    const { code, out, err } = await run(['trips.csv', '--format', 'csv']);
    expect(code).toBe(0);
    const lines = out.trim().split('\n');
    expect(lines[0]).toMatch(/^trip_id,traveler,trip,option,airport/);
    expect(lines).toHaveLength(1 + 4);
    expect(err).toContain('not guarantees');
  });

  it('applies an MCT override file and the target', async () => {
    const files = { 'trips.csv': tripsCsv, 'mct.csv': 'airport,type,minutes\nDEN,domestic,30\n' };
    const json = JSON.parse((await run(['trips.csv', '--format', 'json', '--mct', 'mct.csv', '--target', '0.8'], files)).out);
    const c = json.trips[0].connections[0];
    expect(c.mctMinutes).toBe(30);
    expect(c.mctSource).toBe('override');
    expect(json.target).toBe(0.8);
  });

  it('fails with the line of a bad MCT rule', async () => {
    const files = { 'trips.csv': tripsCsv, 'mct.csv': 'airport,type,minutes\nDEN,domestic,soon\n' };
    const { code, err } = await run(['trips.csv', '--mct', 'mct.csv'], files);
    expect(code).toBe(1);
    expect(err).toMatch(/line 2: minutes must be a whole number/);
  });

  it.each([
    [['trips.csv', '--target', '1.5'], /--target must be a probability/],
    [['trips.csv', '--format', 'xml'], /--format must be table, json or csv/],
    [['trips.csv', '--seed', 'abc'], /--seed must be a whole number/],
    [['trips.csv', '--rebook-gap', '0'], /--rebook-gap must be whole minutes/],
    [['trips.csv', '--rebook-gap-trip', 'nope'], /TRIP_ID=MINUTES/],
    [['trips.csv', '--rebook-gap-trip', 'Nobody/x/A=60'], /names no trip/],
    [['trips.csv', '--frobnicate'], /Unknown option/],
    [[], /give a file/],
  ])('exits 2 for bad usage %j', async (args, message) => {
    const { code, err } = await run(args);
    expect(code).toBe(2);
    expect(err).toMatch(message);
  });

  it('exits 1 when no leg can be read', async () => {
    const { code, err } = await run(['empty.txt'], { 'empty.txt': 'nothing to see here\n' });
    expect(code).toBe(1);
    expect(err).toMatch(/no flight legs/);
  });

  it('takes a per-trip rebook gap by trip id', async () => {
    const parsedIds = JSON.parse((await run(['trips.csv', '--format', 'json'])).out).trips.map((t: { id: string }) => t.id);
    const json = JSON.parse((await run(['trips.csv', '--format', 'json', '--rebook-gap-trip', `${parsedIds[2]}=60`])).out);
    expect(json.trips[2].rebookGapMinutes).toBe(60);
    expect(json.trips[0].rebookGapMinutes).toBe(180);
  });

  it('refuses a bundle file that is not a posterior bundle, naming it', async () => {
    const io = filesIo({ 'trips.csv': tripsCsv, 'bad.json': '{"format": "something else"}' });
    const code = await runCli(['score', 'trips.csv', '--bundle', 'bad.json'], io, [scoreCommand]);
    expect(code).toBe(1);
    expect(io.err.join('')).toMatch(/bad posterior bundle bad\.json/);
  });

  it('scores against the bundled posteriors by default (BTS on-time sample), with their provenance', async () => {
    const io = filesIo({ 'trips.csv': tripsCsv });
    const code = await runCli(['score', 'trips.csv', '--format', 'json'], io, [scoreCommand]);
    expect(code).toBe(0);
    const json = JSON.parse(io.out.join(''));
    expect(json.bundle.id).toMatch(/\S/);
    const ordDen = json.trips[0].connections[0];
    // ORD-DEN and DEN-SFO were flown in the 2001 sample, so these are route-level posteriors.
    expect(ordDen.inbound.pooling).toBe('route');
    expect(ordDen.inbound.flights).toBeGreaterThan(100);
    expect(ordDen.pMake).toBeGreaterThan(0.3);
    expect(ordDen.pMake).toBeLessThan(1);
    expect(ordDen.pMakeInterval[0]).toBeLessThan(ordDen.pMake);
    expect(ordDen.pMakeInterval[1]).toBeGreaterThan(ordDen.pMake);
  });
});
