// `layline parse`: the documented JSON shape, exit codes, and files or standard input.
import { readFile } from 'node:fs/promises';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { parseCommand } from '../../../main/cli/commands/parse';
import { CliFailure } from '../../../main/cli/io';
import { runCli } from '../../../main/cli/run';
import { captureIo, type CapturedIo } from './capture-io';

const fixtures = path.join(__dirname, '..', '..', 'fixtures', 'itinerary');

function io(stdin = ''): CapturedIo {
  return captureIo({
    cwd: fixtures,
    readInput: async (p) => {
      if (p === '-') return stdin;
      try {
        return await readFile(path.resolve(fixtures, p), 'utf8');
      } catch {
        throw new CliFailure(`no such file: ${p}`);
      }
    },
  });
}

describe('layline parse', () => {
  it('prints trips, legs, connections and problems in the documented shape, and exits 0', async () => {
    const cli = io();
    expect(await runCli(['parse', 'trips.csv'], cli, [parseCommand])).toBe(0);
    const json = JSON.parse(cli.out.join(''));
    expect(Object.keys(json)).toEqual(['trips', 'problems']);
    const [trip] = json.trips;
    expect(Object.keys(trip)).toEqual(['id', 'traveler', 'trip', 'option', 'legs', 'connections']);
    expect(Object.keys(trip.legs[0])).toEqual(['flight', 'from', 'to', 'departLocal', 'arriveLocal', 'departUtc', 'arriveUtc', 'fromZone', 'toZone', 'line']);
    expect(trip.legs[0]).toEqual({
      flight: 'UA901',
      from: 'SFO',
      to: 'FRA',
      departLocal: '2026-03-08T19:05',
      arriveLocal: '2026-03-09T15:05',
      departUtc: '2026-03-09T02:05:00Z',
      arriveUtc: '2026-03-09T14:05:00Z',
      fromZone: 'America/Los_Angeles',
      toZone: 'Europe/Berlin',
      line: 2,
    });
    expect(json.trips[1].connections).toEqual([{ airport: 'LHR', layoverMinutes: 150, flags: ['airport-change', 'separate-tickets'] }]);
    expect(json.problems).toEqual([]);
    expect(cli.err.join('')).toMatch(/read 6 legs in 3 trips \(csv\); 0 errors, 0 warnings/);
  });

  it('lists problems with line, severity, code and message only', async () => {
    const cli = io();
    expect(await runCli(['parse', 'email.txt'], cli, [parseCommand])).toBe(0);
    const { problems } = JSON.parse(cli.out.join(''));
    expect(problems.map((p: { line: number; code: string }) => [p.line, p.code])).toEqual([
      [1, 'ignored-line'],
      [10, 'ignored-line'],
      [11, 'incomplete-leg'],
      [12, 'ignored-line'],
    ]);
    for (const p of problems) expect(Object.keys(p)).toEqual(['line', 'severity', 'code', 'message']);
  });

  it('reads standard input for -, and exits 1 when no leg could be read', async () => {
    const cli = io('flight,from,depart,to,arrive\nXX 1,QQQ,2026-06-01 10:00,BOS,11:10\n');
    expect(await runCli(['parse', '-'], cli, [parseCommand])).toBe(1);
    const { trips, problems } = JSON.parse(cli.out.join(''));
    expect(trips).toEqual([]);
    expect(problems.map((p: { code: string }) => p.code)).toEqual(['no-legs', 'unknown-airport']);
  });

  it('detects an iCalendar file by its name and content', async () => {
    const cli = io();
    expect(await runCli(['parse', 'custom-zone.ics'], cli, [parseCommand])).toBe(0);
    expect(JSON.parse(cli.out.join('')).trips[0].legs[0].arriveUtc).toBe('2026-03-11T06:30:00Z');
  });

  it('exits 2 for usage errors: no input, two inputs, an unknown flag', async () => {
    for (const argv of [['parse'], ['parse', 'a.csv', 'b.csv'], ['parse', '--frobnicate', 'a.csv']]) {
      const cli = io();
      expect(await runCli(argv, cli, [parseCommand]), argv.join(' ')).toBe(2);
      expect(cli.err.join('')).toMatch(/parse/);
    }
  });

  it('exits 1 with a clear message for a missing file', async () => {
    const cli = io();
    expect(await runCli(['parse', 'nope.csv'], cli, [parseCommand])).toBe(1);
    expect(cli.err.join('')).toMatch(/no such file: nope.csv/);
  });

  it('is listed with its usage', async () => {
    const cli = io();
    expect(await runCli(['parse', '--help'], cli, [parseCommand])).toBe(0);
    expect(cli.out.join('')).toMatch(/Usage: layline parse <file\|->/);
  });
});
