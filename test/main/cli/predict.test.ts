import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nodeIo } from '../../../main/cli/node-io';
import { runCli } from '../../../main/cli/run';
import { predictCommand } from '../../../main/cli/commands/predict';
import { syntheticBundle } from '../../shared/delay/bundle/synthetic-bundle';
import { captureIo, type CapturedIo } from './capture-io';

let dir: string;
let bundlePath: string;
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-predict-'));
  bundlePath = path.join(dir, 'bundle.json');
  await writeFile(bundlePath, JSON.stringify(await syntheticBundle()));
  await writeFile(path.join(dir, 'foreign.json'), '{"type":"FeatureCollection","features":[]}');
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function capture(): CapturedIo {
  return captureIo({ ...nodeIo(), stderrIsTty: false });
}

async function predict(args: string[]) {
  const io = capture();
  const code = await runCli(['predict', ...args], io, [predictCommand]);
  return { code, out: io.out.join(''), err: io.err.join('') };
}

interface PredictJson {
  route: string;
  kind: string;
  pooled: boolean;
  flights: number;
  exceedance: { minutes: number; p: number; interval: [number, number] }[];
}

describe('layline predict', () => {
  it('prints exceedance probabilities with intervals as JSON for a fitted route', async () => {
    const { code, out } = await predict(['--route', 'ORD-ATL', '--over', '15,30,60,120', '--bundle', bundlePath, '--json']);
    expect(code).toBe(0);
    const json = JSON.parse(out) as PredictJson;
    expect(json).toMatchObject({ route: 'ORD-ATL', kind: 'arrival', pooled: false, flights: 1500 });
    expect(json.exceedance.map((e) => e.minutes)).toEqual([15, 30, 60, 120]);
    for (const e of json.exceedance) {
      expect(e.interval[0]).toBeLessThanOrEqual(e.p);
      expect(e.interval[1]).toBeGreaterThanOrEqual(e.p);
    }
    // Exceedance falls with the threshold.
    const ps = json.exceedance.map((e) => e.p);
    expect([...ps].sort((a, b) => b - a)).toEqual(ps);
  });

  it('answers for an unseen route with pooled: true', async () => {
    const { code, out } = await predict(['--route', 'DEN-ORD', '--bundle', bundlePath, '--json']);
    expect(code).toBe(0);
    expect(JSON.parse(out)).toMatchObject({ route: 'DEN-ORD', pooled: true, flights: 0 });
  });

  it('derives departure delays and says so in the table', async () => {
    const { code, out } = await predict(['--route', 'ORD-ATL', '--kind', 'departure', '--bundle', bundlePath]);
    expect(code).toBe(0);
    expect(out).toMatch(/departure delay/);
    expect(out).toMatch(/Derived, not fitted/);
    expect(out).toMatch(/not guarantees/);
  });

  it('fails with exit 1 naming an unknown airport code', async () => {
    const { code, err } = await predict(['--route', 'QJQ-ATL', '--bundle', bundlePath]);
    expect(code).toBe(1);
    expect(err).toMatch(/QJQ/);
  });

  it('rejects a foreign file given as a bundle with a clear message', async () => {
    const { code, err } = await predict(['--route', 'ORD-ATL', '--bundle', path.join(dir, 'foreign.json')]);
    expect(code).toBe(1);
    expect(err).toMatch(/not a valid route-posterior bundle/);
  });

  it.each([
    [['--over', '15'], /--route/],
    [['--route', 'ORDATL'], /two IATA codes/],
    [['--route', 'ORD-ATL', '--over', '15,abc'], /could not read 'abc'/],
    [['--route', 'ORD-ATL', '--kind', 'taxi'], /arrival or departure/],
  ])('exits 2 for bad usage %j', async (args, message) => {
    const { code, err } = await predict(args);
    expect(code).toBe(2);
    expect(err).toMatch(message);
  });

  it('uses the bundled posteriors by default (the committed fit of the BTS on-time sample)', async () => {
    const { code, out } = await predict(['--route', 'ORD-ATL', '--over', '60', '--json']);
    expect(code).toBe(0);
    const json = JSON.parse(out) as PredictJson;
    expect(json.pooled).toBe(false);
    expect(json.flights).toBeGreaterThan(1000);
    // BTS sample, all routes pooled: 5.1% of flights arrive more than an hour late; a busy hub route is of that order.
    expect(json.exceedance[0]!.p).toBeGreaterThan(0.02);
    expect(json.exceedance[0]!.p).toBeLessThan(0.15);
  });
});
