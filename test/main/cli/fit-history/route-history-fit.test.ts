import { mkdtemp, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { isRouteHistoryFit, runRouteHistoryFit } from '../../../../main/cli/fit-history/route-history-fit';
import { CliFailure, UsageError } from '../../../../main/cli/io';
import { readHistoryFile } from '../../../../main/history/read-history-file';
import { writeSyntheticBtsCsv } from '../../../../main/history/synthetic-history';
import { validateBundle } from '../../../../shared/delay/bundle/bundle-schema';
import { dayNumber } from '../../../../shared/history/cells';
import { fitRouteHistory } from '../../../../shared/history/history-fit';
import { captureIo as captureCliIo, type CapturedIo } from '../capture-io';

let dir: string;
let history: string;
let like: string;
const OLD_BUNDLE = '{"an": "existing bundle that must survive"}';

function captureIo(onStderr?: (text: string) => void): CapturedIo {
  return captureCliIo({ cwd: dir, readInput: async () => '' }, onStderr);
}

async function leftovers(): Promise<string[]> {
  return (await readdir(dir)).filter((f) => f.endsWith('.tmp'));
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-cli-fit-'));
  history = path.join(dir, 'history.csv');
  await writeSyntheticBtsCsv(history, { rows: 20_000, seed: 21, firstDay: dayNumber(2024, 1, 1), days: 91, airports: 3, disruptedWeight: 0 });
  // The model to refit: a one-Gumbel-per-route bundle, standing in for the default bundle.
  const { table } = await readHistoryFile(history);
  const seedFit = await fitRouteHistory(table, {
    method: 'map',
    seed: 1,
    candidate: { name: 'gumbel', family: 'gumbel', monthEffects: [], description: 'one Gumbel per route' },
    metadata: { id: 'like', title: 'like', source: 'synthetic', license: 'test', createdAt: '2026-12-01T00:00:00Z' },
    evaluationDraws: 10,
  });
  like = path.join(dir, 'like.json');
  await writeFile(like, JSON.stringify(seedFit.bundle));
}, 120_000);
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('isRouteHistoryFit', () => {
  it('picks the route path out of the fit command arguments', () => {
    expect(isRouteHistoryFit(['h.csv', '--model', 'route'])).toBe(true);
    expect(isRouteHistoryFit(['h.csv', '--model=route'])).toBe(true);
    expect(isRouteHistoryFit(['h.csv', '--model', 'grouped'])).toBe(false);
  });
});

describe('layline fit <history> --model route', () => {
  it('saves a loadable bundle and prints the held-out scores and calibration as JSON', async () => {
    const out = path.join(dir, 'fitted.json');
    const io = captureIo();
    const code = await runRouteHistoryFit([history, '--model', 'route', '--out', out, '--like', like, '--json'], io);
    expect(code).toBe(0);
    const bundle = validateBundle(JSON.parse(await readFile(out, 'utf8')));
    expect(bundle.departure.derived).toBe(false);
    const summary = JSON.parse(io.out.join(''));
    expect(summary).toMatchObject({ model: 'route', family: 'gumbel', method: 'map', format: 'csv', holdout: { holdoutAfter: '2024-02-29', defaulted: true } });
    expect(summary.import.cancelled).toBeGreaterThan(0);
    expect(summary.import.diverted).toBeGreaterThan(0);
    expect(summary.heldOut.arrival.calibration.map((r: { minutes: number }) => r.minutes)).toEqual([15, 30, 60, 120, 180]);
    expect(summary.heldOut.arrival.natsPerFlight).toBeLessThan(0);
    expect(summary.heldOut.departure.flights).toBeGreaterThan(0);
    expect(summary.bundle.departures).toBe('fitted');
    // Progress with an ETA on stderr (plain lines, as stderr is not a terminal here).
    expect(io.err.join('')).toMatch(/ETA \d+:\d\d\s+arrival: refit on all flights/);
    expect(await leftovers()).toEqual([]);
  }, 60_000);

  it('refits the model choice of the default bundle when --like is absent', async () => {
    const out = path.join(dir, 'default-model.json');
    const io = captureIo();
    expect(await runRouteHistoryFit([history, '--model', 'route', '--out', out, '--json', '--max-iterations', '300'], io)).toBe(0);
    const summary = JSON.parse(io.out.join(''));
    const shipped = JSON.parse(await readFile(path.resolve(__dirname, '../../../../shared/data/route-posteriors.json'), 'utf8'));
    expect(summary.family).toBe(`${shipped.model.family}${shipped.model.monthEffects.length ? '+month' : ''}`);
    expect(validateBundle(JSON.parse(await readFile(out, 'utf8'))).model).toEqual(shipped.model);
  }, 120_000);

  it('honours --holdout-after and prints tables without --json', async () => {
    const out = path.join(dir, 'fitted-text.json');
    const io = captureIo();
    expect(await runRouteHistoryFit([history, '--model', 'route', '--out', out, '--like', like, '--holdout-after', '2024-03-15', '--baseline', like], io)).toBe(0);
    const text = io.out.join('');
    expect(text).toMatch(/Held out \d+ flights after 2024-03-15/);
    expect(text).toMatch(/held-out log score: -\d\.\d{4} nats per flight over \d+ flights \(like: -\d\.\d{4}\)/);
    expect(text).toMatch(/Departure delays \(fitted directly\)/);
    expect(text).toMatch(/not guarantees/);
  }, 60_000);

  describe.each([
    ['wrong columns', 'name,age\nAda,36\n', /no column for the flight date/],
    ['binary garbage', Buffer.from(Array.from({ length: 5000 }, (_, i) => (i * 131 + 7) % 256)), /binary data/],
    ['a huge single line', 'FlightDate,Origin,Dest,ArrDelay\n' + '9'.repeat(2 * 1024 * 1024), /longer than 1048576 characters/],
  ])('on a file with %s', (_name, content, message) => {
    it('fails clearly and leaves the existing bundle untouched', async () => {
      const input = path.join(dir, 'hostile.csv');
      await writeFile(input, content);
      const out = path.join(dir, 'kept.json');
      await writeFile(out, OLD_BUNDLE);
      const run = runRouteHistoryFit([input, '--model', 'route', '--out', out, '--like', like], captureIo());
      await expect(run).rejects.toBeInstanceOf(CliFailure);
      await expect(runRouteHistoryFit([input, '--model', 'route', '--out', out, '--like', like], captureIo())).rejects.toThrow(message);
      expect(await readFile(out, 'utf8')).toBe(OLD_BUNDLE);
      expect(await leftovers()).toEqual([]);
    });
  });

  it('stops when cancelled mid-fit, exits 130 and leaves the existing bundle untouched', async () => {
    const out = path.join(dir, 'cancelled.json');
    await writeFile(out, OLD_BUNDLE);
    const controller = new AbortController();
    const io = captureIo((t) => {
      if (t.includes('fit without the held-out month')) controller.abort();
    });
    const run = runRouteHistoryFit([history, '--model', 'route', '--out', out, '--like', like], io, { signal: controller.signal });
    await expect(run).rejects.toMatchObject({ exitCode: 130, message: expect.stringMatching(/cancelled; cancelled.json was not written or changed/) });
    expect(controller.signal.aborted).toBe(true);
    expect(await readFile(out, 'utf8')).toBe(OLD_BUNDLE);
    expect(await leftovers()).toEqual([]);
  }, 60_000);

  it.each([
    [['--model', 'route', '--like', 'x.json'], /--out FILE is required/],
    [['--model', 'route', '--out', 'b.json', '--method', 'nuts'], /takes --method map, advi, svi/],
    [['--model', 'route', '--out', 'b.json', '--holdout-after', '2024-02-30'], /YYYY-MM-DD/],
    [['--model', 'route', '--out', 'b.json', '--column', 'gate=Gate'], /--column needs FIELD=NAME/],
  ])('rejects bad usage %j with exit code 2', async (args, message) => {
    await expect(runRouteHistoryFit([history, ...args], captureIo())).rejects.toThrow(UsageError);
    await expect(runRouteHistoryFit([history, ...args], captureIo())).rejects.toThrow(message);
  });

  it('refuses an --out folder that does not exist before reading anything', async () => {
    await expect(runRouteHistoryFit([history, '--model', 'route', '--out', path.join(dir, 'no', 'such', 'b.json'), '--like', like], captureIo())).rejects.toThrow(/cannot write into/);
  });

  it('asks for --like when no default bundle is available', async () => {
    await expect(runRouteHistoryFit([history, '--model', 'route', '--out', path.join(dir, 'b.json')], captureIo(), { defaultBundle: async () => null })).rejects.toThrow(/--like BUNDLE/);
  });
});
