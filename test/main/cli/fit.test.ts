import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../../main/cli/io';
import { nodeIo } from '../../../main/cli/node-io';
import { runCli } from '../../../main/cli/run';
import { gumbelSample } from '../../../shared/delay/gumbel';
import { createRng } from '../../../shared/inference/rng';

let dir = '';

function io(tty = false): CliIo & { out: () => string; err: () => string } {
  const out: string[] = [];
  const err: string[] = [];
  const real = nodeIo();
  return { ...real, stdout: (t) => out.push(t), stderr: (t) => err.push(t), stderrIsTty: tty, out: () => out.join(''), err: () => err.join('') };
}

async function csv(name: string, text: string): Promise<string> {
  const file = path.join(dir, name);
  await writeFile(file, text, 'utf8');
  return file;
}

// Three invented groups with known Gumbel parameters, rounded to whole minutes as delays are.
const TRUTH = [
  { group: 'north', location: 4, scale: 9 },
  { group: 'harbour', location: 15, scale: 20 },
  { group: 'valley', location: -2, scale: 6 },
];
const PER_GROUP = 400;
let dataFile = '';

beforeAll(async () => {
  dir = await mkdtemp(path.join(tmpdir(), 'layline-fit-'));
  const rng = createRng(20);
  const rows = ['group,value'];
  for (let i = 0; i < PER_GROUP; i++) for (const t of TRUTH) rows.push(`${t.group},${Math.round(gumbelSample(rng, t.location, t.scale))}`);
  dataFile = await csv('delays.csv', rows.join('\n') + '\n');
});

afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

interface FitJson {
  method: string;
  elapsedMs: number;
  iterations: number;
  diagnostics: Record<string, number | string | boolean>;
  groups: { group: string; location: { mean: number; sd: number }; scale: { mean: number; sd: number } }[];
}

describe.each([
  { method: 'map', extra: [] as string[] },
  { method: 'advi', extra: [] },
  { method: 'fullrank', extra: [] },
  { method: 'svi', extra: [] },
  { method: 'nuts', extra: ['--chains', '2', '--warmup', '300', '--draws', '300'] },
])('layline fit --method $method', ({ method, extra }) => {
  it('prints the JSON shape of the issue and recovers each group', async () => {
    const cli = io();
    const code = await runCli(['fit', dataFile, '--model', 'grouped', '--method', method, '--seed', '3', '--json', ...extra], cli);
    expect(code, cli.err()).toBe(0);
    const out = JSON.parse(cli.out()) as FitJson;
    expect(Object.keys(out)).toEqual(['method', 'elapsedMs', 'iterations', 'diagnostics', 'groups']);
    expect(out.method).toBe(method);
    expect(out.iterations).toBeGreaterThan(0);
    expect(out.elapsedMs).toBeGreaterThanOrEqual(0);
    expect(out.diagnostics['observations']).toBe(3 * PER_GROUP);
    expect(out.diagnostics['likelihood']).toBe('point');
    expect(out.diagnostics['groups']).toBe(3);
    expect(out.groups.map((g) => g.group)).toEqual(TRUTH.map((t) => t.group));
    for (const [i, g] of out.groups.entries()) {
      const t = TRUTH[i]!;
      // 400 draws per group: the sampling sd of the location is about 1.1 scale / sqrt(400).
      expect(Math.abs(g.location.mean - t.location), `${g.group} location`).toBeLessThan(0.25 * t.scale);
      expect(Math.abs(g.scale.mean / t.scale - 1), `${g.group} scale`).toBeLessThan(0.15);
      expect(g.location.sd).toBeGreaterThan(0);
      expect(g.scale.sd).toBeGreaterThan(0);
    }
    if (method === 'nuts') {
      expect(out.diagnostics['divergences']).toBe(0);
      expect(out.diagnostics['maxRhat'] as number).toBeLessThan(1.05);
    }
    if (method === 'advi' || method === 'fullrank' || method === 'svi') expect(typeof out.diagnostics['paretoK']).toBe('number');
  });
});

describe('layline fit', () => {
  it('prints a table with every group, the diagnostics and the caution', async () => {
    const cli = io();
    expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'map'], cli)).toBe(0);
    const text = cli.out();
    for (const t of TRUTH) expect(text).toMatch(new RegExp(`^${t.group}\\s+-?\\d+\\.\\d\\d ± `, 'm'));
    expect(text).toMatch(/grouped model, map: 1200 observations, \d+ iterations, \d+ ms/);
    expect(text).toMatch(/diagnostics:\n/);
    expect(text).toContain('not guarantees');
  });

  it('prints a warning under the table when the sampler has not converged', async () => {
    const cli = io();
    expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'nuts', '--chains', '2', '--warmup', '5', '--draws', '8'], cli)).toBe(0);
    expect(cli.out()).toMatch(/^warning: bulk effective sample size \d+ is below 200/m);
    const json = io();
    await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'nuts', '--chains', '2', '--warmup', '5', '--draws', '8', '--json'], json);
    expect((JSON.parse(json.out()) as FitJson).diagnostics['warnings']).toMatch(/effective sample size/);
  });

  it("gives MAP sds from the full Laplace approximation that match NUTS's posterior sds", async () => {
    const fit = async (method: string) => {
      const cli = io();
      expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', method, '--chains', '2', '--warmup', '300', '--draws', '500', '--json'], cli), cli.err()).toBe(0);
      return JSON.parse(cli.out()) as FitJson;
    };
    const map = await fit('map');
    const nuts = await fit('nuts');
    expect(map.diagnostics['summaryDraws']).toMatch(/Laplace approximation \(full Hessian\)/);
    expect(nuts.diagnostics['summaryDraws']).toBe('all kept NUTS draws');
    map.groups.forEach((g, i) => {
      const n = nuts.groups[i]!;
      for (const ratio of [g.location.sd / n.location.sd, g.scale.sd / n.scale.sd]) {
        expect(ratio, `${g.group}: MAP sd / NUTS sd`).toBeGreaterThan(0.7);
        expect(ratio).toBeLessThan(1.4);
      }
    });
  });

  it('is reproducible from --seed', async () => {
    const run = async (seed: string) => {
      const cli = io();
      await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'advi', '--seed', seed, '--json'], cli);
      return (JSON.parse(cli.out()) as FitJson).groups;
    };
    expect(await run('5')).toEqual(await run('5'));
  });

  it('draws a progress bar on stderr only when stderr is a terminal', async () => {
    const tty = io(true);
    expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'nuts', '--chains', '1', '--warmup', '200', '--draws', '200', '--json'], tty)).toBe(0);
    expect(tty.err()).toMatch(/\[#+-*\]\s+\d+%/);
    expect(tty.err()).toMatch(/100%/);
    const plain = io(false);
    expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'map', '--json'], plain)).toBe(0);
    expect(plain.err()).toBe('');
  });

  it('reads columns named by --group-column and --value-column, semicolon separated', async () => {
    const file = await csv('named.csv', 'route;arrival_delay\nA;3\nA;7\nA;-1\nB;12\nB;30\nB;18\n');
    const cli = io();
    expect(await runCli(['fit', file, '--model', 'grouped', '--method', 'map', '--group-column', 'route', '--value-column', 'arrival_delay', '--json'], cli), cli.err()).toBe(0);
    expect((JSON.parse(cli.out()) as FitJson).groups.map((g) => g.group)).toEqual(['A', 'B']);
  });

  it('fits the rounded-minute interval likelihood with --likelihood interval, close to the point fit for wide delays', async () => {
    const run = async (likelihood: string) => {
      const cli = io();
      expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'map', '--likelihood', likelihood, '--json'], cli), cli.err()).toBe(0);
      return (JSON.parse(cli.out()) as FitJson).groups;
    };
    const point = await run('point');
    const interval = await run('interval');
    expect(interval.some((g, i) => g.scale.mean !== point[i]!.scale.mean)).toBe(true);
    // Rounding to the minute changes a Gumbel of scale >= 6 very little (Sheppard: variance + 1/12).
    interval.forEach((g, i) => {
      expect(Math.abs(g.location.mean - point[i]!.location.mean)).toBeLessThan(0.1);
      expect(Math.abs(g.scale.mean / point[i]!.scale.mean - 1)).toBeLessThan(0.01);
    });
    const bad = io();
    expect(await runCli(['fit', dataFile, '--model', 'grouped', '--method', 'map', '--likelihood', 'binned'], bad)).toBe(2);
    expect(bad.err()).toMatch(/--likelihood must be point or interval/);
  });

  it('names the missing column and lists the ones present (exit 1)', async () => {
    const file = await csv('nocol.csv', 'team,minutes\nA,3\nB,4\n');
    const cli = io();
    expect(await runCli(['fit', file, '--model', 'grouped', '--method', 'map'], cli)).toBe(1);
    expect(cli.err()).toMatch(/has no column 'group' or 'g' \(columns: 'team', 'minutes'\); name it with --group-column/);
    const named = io();
    expect(await runCli(['fit', file, '--model', 'grouped', '--method', 'map', '--group-column', 'team', '--value-column', 'delay'], named)).toBe(1);
    expect(named.err()).toMatch(/no column 'delay'/);
  });

  it('names the line of a non-numeric value (exit 1)', async () => {
    const file = await csv('text.csv', 'group,value\nA,3\nA,late\nB,4\n');
    const cli = io();
    expect(await runCli(['fit', file, '--model', 'grouped', '--method', 'advi'], cli)).toBe(1);
    expect(cli.err()).toMatch(/line 3: column 'value' holds 'late', which is not a number/);
    const empty = io();
    expect(await runCli(['fit', await csv('empty-cell.csv', 'group,value\nA,3\nA,\n'), '--model', 'grouped', '--method', 'map'], empty)).toBe(1);
    expect(empty.err()).toMatch(/line 3: column 'value' is empty/);
  });

  it('refuses a single observation and an empty file (exit 1)', async () => {
    const one = io();
    expect(await runCli(['fit', await csv('one.csv', 'group,value\nA,12\n'), '--model', 'grouped', '--method', 'nuts'], one)).toBe(1);
    expect(one.err()).toMatch(/a single observation: a fit needs at least 2/);
    const none = io();
    expect(await runCli(['fit', await csv('blank.csv', '\n\n'), '--model', 'grouped', '--method', 'map'], none)).toBe(1);
    expect(none.err()).toMatch(/is empty/);
  });

  it('reports a missing file (exit 1) and usage errors (exit 2)', async () => {
    const missing = io();
    expect(await runCli(['fit', path.join(dir, 'nope.csv'), '--model', 'grouped', '--method', 'map'], missing)).toBe(1);
    expect(missing.err()).toMatch(/no such file/);
    for (const args of [
      [dataFile, '--model', 'grouped'],
      [dataFile, '--model', 'grouped', '--method', 'gibbs'],
      [dataFile, '--method', 'map'],
      [dataFile, '--model', 'airline', '--method', 'map'],
      [dataFile, '--model', 'grouped', '--method', 'map', '--seed', 'x'],
      [dataFile, '--model', 'grouped', '--method', 'map', '--frobnicate'],
      ['--model', 'grouped', '--method', 'map'],
    ]) {
      const cli = io();
      expect(await runCli(['fit', ...args], cli), args.join(' ')).toBe(2);
      expect(cli.err()).toMatch(/layline: /);
    }
  });

  it('shows its usage with --help', async () => {
    const cli = io();
    expect(await runCli(['fit', '--help'], cli)).toBe(0);
    expect(cli.out()).toMatch(/Usage: layline fit <csv> --model NAME --method METHOD/);
    expect(cli.out()).toMatch(/map, advi, fullrank, svi, nuts/);
  });
});
