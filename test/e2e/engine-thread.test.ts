// The desktop app's engine host for real: the built dist/main/engine-thread.cjs in a Node
// worker thread, driven through the main process's client. History is read by path, fitted
// bundles land in the folder given as workerData, and the choice of bundle survives a restart.
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { formatInTimeZone } from 'date-fns-tz';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createThreadEngine } from '../../main/electron/engine-thread-client';
import { BundleLibrary } from '../../main/history/bundle-library';
import { previewHistoryRef, readHistoryRef } from '../../main/history/history-file-refs';
import { createClaims } from '../../main/scoring/group-claims';
import { PairWorker } from '../../main/scoring/pair-workers';
import { createEngineHost } from '../../shared/api/engine-host';
import { createBundleSource } from '../../shared/delay/bundle/posterior-source';
import { loadDefaultPosteriorSource } from '../../shared/delay/bundle/default-bundle';
import { solvePlan } from '../../shared/risk/pair-jobs';
import { prepareScoring } from '../../shared/risk/score-trips';
import { findAirport } from '../../shared/time/airports';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../shared/workspace/settings';
import { groupTrips } from '../fixtures/risk/group-trips';
import { writeSyntheticBtsCsv } from '../../main/history/synthetic-history';
import { dayNumber } from '../../shared/history/cells';

const THREAD = path.resolve(__dirname, '../../dist/main/engine-thread.cjs');
const HELPER = path.resolve(__dirname, '../../dist/main/score-pair-worker.cjs');
let dir: string;
let history: string;
let bundles: string;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-thread-'));
  history = path.join(dir, 'history.csv');
  bundles = path.join(dir, 'user-data', 'bundles');
  await writeSyntheticBtsCsv(history, { rows: 6000, seed: 12, firstDay: dayNumber(2024, 3, 1), days: 61, airports: 3 });
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

const start = () => createThreadEngine(THREAD, (file) => new Worker(file, { workerData: { bundleFolder: bundles } }));

describe('the engine thread', () => {
  it('fits a history file by path, keeps the bundle in its folder and remembers the choice across restarts', async () => {
    const engine = start();
    try {
      const preview = await engine.previewHistory({ kind: 'path', path: history });
      expect(preview.detection.layout).toBe('bts');
      const { jobId } = await engine.startHistoryFit({ source: { kind: 'path', path: history } });
      let status = await engine.historyFitStatus(jobId);
      while (status.state === 'reading' || status.state === 'fitting') {
        await new Promise((r) => setTimeout(r, 50));
        status = await engine.historyFitStatus(jobId);
      }
      expect(status.state).toBe('done');
      const entry = await engine.saveFittedBundle(jobId);
      expect(path.dirname(entry.file)).toBe(bundles);
      expect(JSON.parse(await readFile(entry.file, 'utf8')).id).toBe(entry.id);
      await engine.useBundle({ kind: 'library', id: entry.id });
      expect((await engine.getBundleInfo()).bundle?.id).toBe(entry.id);
      await expect(engine.previewHistory({ kind: 'blob', name: 'x.csv', blob: new Blob(['a']) })).rejects.toThrow(/reads delay history by path/);
    } finally {
      await engine.close();
    }
    const again = start();
    try {
      const listed = await again.listBundles();
      expect(listed.active.kind).toBe('library');
      expect((await again.getBundleInfo()).bundle?.id).toBe(listed.entries[0]?.id);
      await again.useBundle({ kind: 'default' });
      expect((await again.getBundleInfo()).bundle?.id).toBe(listed.default.id);
    } finally {
      await again.close();
    }
    expect((await readdir(bundles)).sort()).toEqual(['active.json', expect.stringMatching(/^history-history\.csv-.*\.json$/)]);
  }, 120_000);

  // A group large enough to share its connection work with the thread's helper.
  const group = groupTrips(60);
  // The fixture's instants as each airport's local time (IANA zones via date-fns-tz), as a coordinator's file has them.
  const local = (ms: number, code: string) => formatInTimeZone(ms, findAirport(code)!.zone, 'yyyy-MM-dd HH:mm');
  const csv = ['traveler,trip,option,flight,from,depart,to,arrive,booking,deadline']
    .concat(group.trips.flatMap((t) => t.legs.map((l) => [t.traveler, t.trip, t.option, l.flight, l.from, local(l.departUtcMs, l.from), l.to, local(l.arriveUtcMs, l.to), '', ''].join(','))))
    .join('\n');
  const numbers = (a: Awaited<ReturnType<ReturnType<typeof start>['analyzeTrips']>>) => ({ trips: a.trips, group: a.group, problems: a.problems.length });

  it('scores a large group with the numbers of one thread, with the bundle that ships and with a fitted one', async () => {
    const engine = start();
    try {
      const library = new BundleLibrary(bundles);
      const here = createEngineHost({ host: { version: '0', runtime: 'electron', platform: process.platform }, store: library, previewHistory: previewHistoryRef, readHistory: readHistoryRef, nowMs: () => 0 });
      const fitted = (await library.list()).entries[0]!.id;
      for (const choice of [{ kind: 'default' as const }, { kind: 'library' as const, id: fitted }]) {
        await engine.useBundle(choice);
        await here.useBundle(choice);
        const threaded = await engine.analyzeTrips(csv, DEFAULT_ANALYSIS_SETTINGS);
        expect(threaded.scoringError).toBeNull();
        expect(threaded.problems.filter((p) => p.severity === 'error')).toEqual([]);
        expect(threaded.trips.length).toBe(group.trips.length);
        expect(numbers(threaded)).toEqual(numbers(await here.analyzeTrips(csv, DEFAULT_ANALYSIS_SETTINGS)));
      }
      await engine.useBundle({ kind: 'default' });
    } finally {
      await engine.close();
    }
  }, 120_000);

  it('ships a helper that loads either bundle and answers as this thread would', async () => {
    const fitted = (await new BundleLibrary(bundles).list()).entries[0]!.id;
    const helper = new PairWorker(HELPER, (file) => new Worker(file, { workerData: { bundleFolder: bundles } }));
    try {
      const sources = [
        { spec: { choice: { kind: 'default' }, generation: 0 }, source: loadDefaultPosteriorSource() },
        { spec: { choice: { kind: 'library', id: fitted }, generation: 3 }, source: createBundleSource(await new BundleLibrary(bundles).load(fitted)) },
      ];
      for (const { spec, source } of sources) {
        const { plan } = prepareScoring(group, source, { countryOf: (c) => findAirport(c)?.country });
        const answers = await helper.request(plan, spec, source.info.id, createClaims());
        const reference = solvePlan(source, plan);
        expect(answers.length).toBe(plan.jobs.length);
        for (const a of answers) expect(Array.from(a.byDraw)).toEqual(Array.from(reference[a.job]!.byDraw));
      }
      await expect(helper.request(prepareScoring(group, loadDefaultPosteriorSource(), { countryOf: (c) => findAirport(c)?.country }).plan, { choice: { kind: 'other' }, generation: 0 }, 'x', createClaims())).rejects.toThrow(/not a bundle the scoring helper knows/);
    } finally {
      await helper.close();
    }
  }, 120_000);
});
