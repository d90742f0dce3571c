// Scoring on two threads (main/scoring/pair-workers.ts) with a real Node worker thread: the
// helper is the test pair worker bundled with esbuild. The result must be scoreTrips's byte
// for byte, and a helper that fails or scores against another source must not change it.
import { build } from 'esbuild';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createClaims } from '../../../main/scoring/group-claims';
import { checkPairReply, checkPairRequest } from '../../../main/scoring/pair-messages';
import { MIN_PARALLEL_JOBS, PairWorker, scoreInParallel, type ParallelReport } from '../../../main/scoring/pair-workers';
import { solvePlan } from '../../../shared/risk/pair-jobs';
import { prepareScoring, scoreTrips } from '../../../shared/risk/score-trips';
import { findAirport } from '../../../shared/time/airports';
import { groupTrips } from '../../fixtures/risk/group-trips';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const options = { countryOf: (code: string) => findAirport(code)?.country, simulations: 500, seed: 3 };
let dir: string;
let workerFile: string;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-pairs-'));
  workerFile = path.join(dir, 'pair-worker.cjs');
  await build({ entryPoints: [path.resolve(__dirname, '../../fixtures/risk/synthetic-pair-worker.ts')], bundle: true, platform: 'node', format: 'cjs', outfile: workerFile, logLevel: 'error' });
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const report = (): ParallelReport => ({ here: 0, helper: 0, waitMs: 0 });

/**
 * A worker from `code` whose requests reserve every group before they are sent, as if it had
 * claimed them all at once: the scoring thread then depends on it for the whole plan.
 */
function greedyWorker(code: string): Worker {
  const worker = new Worker(code, { eval: true });
  const post = worker.postMessage.bind(worker);
  worker.postMessage = (message: { claims: SharedArrayBuffer }) => {
    Atomics.store(new Int32Array(message.claims), 0, 1e6);
    post(message);
  };
  return worker;
}
const parsed = groupTrips(60);

describe('scoreInParallel', () => {
  it('gives scoreTrips\'s output byte for byte, run after run', async () => {
    const helper = new PairWorker(workerFile);
    try {
      const expected = JSON.stringify(scoreTrips(parsed, syntheticSource({ seed: 7 }), options));
      for (let run = 0; run < 3; run++) {
        const r = report();
        const scored = await scoreInParallel(parsed, syntheticSource({ seed: 7 }), { seed: 7 }, options, helper, r);
        expect(JSON.stringify(scored)).toBe(expected);
        expect(r.fallback).toBeUndefined();
        expect(r.here + r.helper).toBe(prepareScoring(parsed, syntheticSource(), options).plan.groups.length);
      }
    } finally {
      await helper.close();
    }
  });

  it('lets the helper solve a whole plan, with the same answers as this thread', async () => {
    const helper = new PairWorker(workerFile);
    try {
      const source = syntheticSource({ seed: 7 });
      const { plan } = prepareScoring(parsed, source, options);
      expect(plan.jobs.length).toBeGreaterThanOrEqual(MIN_PARALLEL_JOBS);
      // Nobody else claims from this counter, so the helper takes every group.
      const answers = await helper.request(plan, { seed: 7 }, source.info.id, createClaims());
      const reference = solvePlan(source, plan);
      expect(answers.map((a) => a.job).sort((x, y) => x - y)).toEqual(plan.jobs.map((_, k) => k));
      for (const a of answers) {
        expect(Array.from(a.byDraw)).toEqual(Array.from(reference[a.job]!.byDraw));
        expect(a.minLayover).toBe(reference[a.job]!.minLayover);
      }
    } finally {
      await helper.close();
    }
  });

  it('reports a helper that cannot make the source as an error', async () => {
    const helper = new PairWorker(workerFile);
    try {
      const { plan } = prepareScoring(parsed, syntheticSource(), options);
      await expect(helper.request(plan, { nothing: true }, 'synthetic-test', createClaims())).rejects.toThrow(/needs \{ seed \}/);
    } finally {
      await helper.close();
    }
  });

  it('solves here what a helper that dies had claimed, with the same output', async () => {
    const starts: string[] = [];
    // A helper that has every group, then stops without answering.
    const dying = new PairWorker('dying', (file) => {
      starts.push(file);
      return greedyWorker(`require('node:worker_threads').parentPort.on('message', () => process.exit(3));`);
    });
    const r = report();
    const scored = await scoreInParallel(parsed, syntheticSource({ seed: 7 }), { seed: 7 }, options, dying, r);
    expect(JSON.stringify(scored)).toBe(JSON.stringify(scoreTrips(parsed, syntheticSource({ seed: 7 }), options)));
    expect(r.fallback).toMatch(/stopped \(exit code 3\)/);
    expect(r.helper).toBe(0);
    expect(starts).toEqual(['dying']);
    // A report used again tells only of its latest run.
    await scoreInParallel(groupTrips(4), syntheticSource({ seed: 7 }), { seed: 7 }, options, dying, r);
    expect(r.fallback).toBeUndefined();
    await dying.close();
  });

  it('does not trust a helper that scored against another source', async () => {
    const other = new PairWorker('other', () =>
      greedyWorker(`const { parentPort } = require('node:worker_threads');
        parentPort.on('message', (m) => parentPort.postMessage({ id: m.id, sourceId: 'another-bundle', answers: [] }));`),
    );
    try {
      const r = report();
      const scored = await scoreInParallel(parsed, syntheticSource({ seed: 7 }), { seed: 7 }, options, other, r);
      expect(JSON.stringify(scored)).toBe(JSON.stringify(scoreTrips(parsed, syntheticSource({ seed: 7 }), options)));
      expect(r.fallback).toMatch(/scored against another-bundle, not synthetic-test/);
    } finally {
      await other.close();
    }
  });

  it('scores a small input on this thread without starting the helper', async () => {
    let started = 0;
    const helper = new PairWorker(workerFile, (file) => {
      started++;
      return new Worker(file);
    });
    const small = groupTrips(4);
    const r = report();
    const scored = await scoreInParallel(small, syntheticSource({ seed: 7 }), { seed: 7 }, options, helper, r);
    expect(JSON.stringify(scored)).toBe(JSON.stringify(scoreTrips(small, syntheticSource({ seed: 7 }), options)));
    expect(started).toBe(0);
    expect(r.helper).toBe(0);
    await helper.close();
  });
});

describe('the pair messages', () => {
  const { plan } = prepareScoring(parsed, syntheticSource(), options);
  const request = { id: 1, source: null, plan, claims: createClaims() };

  it('accepts a well-formed request and rejects a broken one, naming the part', () => {
    expect(checkPairRequest(request)).toBe(request);
    expect(() => checkPairRequest(null)).toThrow(/not an object/);
    expect(() => checkPairRequest({ ...request, claims: new ArrayBuffer(4) })).toThrow(/claims/);
    expect(() => checkPairRequest({ ...request, plan: { ...plan, target: 1.5 } })).toThrow(/plan settings/);
    expect(() => checkPairRequest({ ...request, plan: { ...plan, groups: [[plan.jobs.length]] } })).toThrow(/a group/);
    expect(() => checkPairRequest({ ...request, plan: { ...plan, jobs: [{ ...plan.jobs[0], mctMinutes: 45.5 }] } })).toThrow(/a job/);
  });

  it('rejects a reply whose answers do not fit the plan', () => {
    const length = plan.jobs[0]!.slacks.length * plan.draws;
    const good = { id: 1, sourceId: 's', answers: [{ job: 0, byDraw: new Float64Array(length), minLayover: 50 }] };
    expect(checkPairReply(good, plan)).toBe(good);
    expect(checkPairReply({ id: 1, error: 'x' }, plan)).toEqual({ id: 1, error: 'x' });
    expect(() => checkPairReply({ ...good, sourceId: undefined }, plan)).toThrow(/source id/);
    expect(() => checkPairReply({ ...good, answers: [{ job: 0, byDraw: new Float64Array(length - 1), minLayover: 50 }] }, plan)).toThrow(/by draw/);
    expect(() => checkPairReply({ ...good, answers: [{ job: plan.jobs.length, byDraw: new Float64Array(length), minLayover: 50 }] }, plan)).toThrow(/job/);
    expect(() => checkPairReply({ ...good, answers: [{ job: 0, byDraw: new Float64Array(length), minLayover: 50.5 }] }, plan)).toThrow(/minimum layover/);
  });
});
