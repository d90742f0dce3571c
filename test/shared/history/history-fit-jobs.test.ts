import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import * as v from 'valibot';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BundleLibrary } from '../../../main/history/bundle-library';
import { HistoryFitJobs } from '../../../shared/history/history-fit-jobs';
import { readHistoryRef } from '../../../main/history/history-file-refs';
import { previewHistoryFile } from '../../../main/history/read-history-file';
import { openAsBlob } from 'node:fs';
import { blobByteSource } from '../../../shared/history/byte-source';
import { readHistorySource } from '../../../shared/history/read-history-source';
import { writeSyntheticBtsCsv } from '../../../main/history/synthetic-history';
import { dayNumber } from '../../../shared/history/cells';
import { HISTORY_REQUESTS } from '../../../shared/history/history-requests';

let dir: string;
let history: string;
let jobs: HistoryFitJobs;
let library: BundleLibrary;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-jobs-'));
  history = path.join(dir, 'history.csv');
  await writeSyntheticBtsCsv(history, { rows: 8000, seed: 8, firstDay: dayNumber(2024, 5, 1), days: 61, airports: 2, disruptedWeight: 0 });
  library = new BundleLibrary(path.join(dir, 'bundles'));
  await mkdir(library.folder);
  jobs = new HistoryFitJobs({
    library,
    read: readHistoryRef,
    candidate: async () => ({ name: 'gumbel', family: 'gumbel', monthEffects: [], description: 'one Gumbel per route' }),
  });
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('HistoryFitJobs', () => {
  it('runs a fit in the background, reports progress and an objective trace, and saves its bundle', async () => {
    const { jobId } = jobs.start({ source: { kind: 'path', path: history } });
    expect(['reading', 'fitting']).toContain(jobs.status(jobId).state);
    const status = await jobs.wait(jobId);
    expect(status).toMatchObject({ state: 'done', fraction: 1, error: null });
    expect(status.trace.length).toBeGreaterThan(3);
    expect(status.summary!.heldOut.arrival.calibration).toHaveLength(5);
    // The status a request would carry matches the request spec the app will validate with.
    expect(() => v.parse(HISTORY_REQUESTS.historyFitStatus.result, status)).not.toThrow();
    const entry = await jobs.save(jobId);
    expect(entry.departures).toBe('fitted');
    await library.use({ kind: 'library', id: entry.id });
    expect((await library.list()).entries.map((e) => [e.id, e.active])).toEqual([[entry.id, true]]);
    expect(() => v.parse(HISTORY_REQUESTS.saveFittedBundle.result, entry)).not.toThrow();
  }, 60_000);

  it('refuses a second fit while one is running', async () => {
    const { jobId } = jobs.start({ source: { kind: 'path', path: history } });
    expect(() => jobs.start({ source: { kind: 'path', path: history } })).toThrow(/already running \(fit-\d+\)/);
    jobs.cancel(jobId);
    await jobs.wait(jobId);
  });

  it('fits a picked file read in slices as the page does, like the same file by path', async () => {
    // The page's worker reads a File; Node's openAsBlob gives the same Blob interface over a file.
    const blobJobs = new HistoryFitJobs({
      library,
      read: (ref, options) => {
        if (ref.kind !== 'blob') throw new Error('expected a blob');
        return readHistorySource(blobByteSource(ref.name, ref.blob), options);
      },
      candidate: async () => ({ name: 'gumbel', family: 'gumbel', monthEffects: [], description: 'one Gumbel per route' }),
    });
    const status = await blobJobs.wait(blobJobs.start({ source: { kind: 'blob', name: 'history.csv', blob: await openAsBlob(history) } }).jobId);
    expect(status.state).toBe('done');
    const byPath = await jobs.wait(jobs.start({ source: { kind: 'path', path: history } }).jobId);
    expect(status.summary!.import).toEqual(byPath.summary!.import);
    expect(status.summary!.heldOut.arrival.natsPerFlight).toBeCloseTo(byPath.summary!.heldOut.arrival.natsPerFlight, 10);
  }, 90_000);

  it('cancels a running fit and then has nothing to save', async () => {
    const { jobId } = jobs.start({ source: { kind: 'path', path: history } });
    expect(jobs.cancel(jobId)).toBe(true);
    const status = await jobs.wait(jobId);
    expect(status).toMatchObject({ state: 'cancelled', error: 'the fit was cancelled; nothing was saved' });
    await expect(jobs.save(jobId)).rejects.toThrow(/no bundle to save/);
    expect(jobs.cancel(jobId)).toBe(false);
  });

  it('reports a hostile file as a failed job with the reader\'s message', async () => {
    const bad = path.join(dir, 'bad.csv');
    await writeFile(bad, 'name,age\nAda,36\n');
    const status = await jobs.wait(jobs.start({ source: { kind: 'path', path: bad } }).jobId);
    expect(status.state).toBe('failed');
    expect(status.error).toMatch(/no column for the flight date/);
  });

  it('previews a file in the shape of the previewHistory request', async () => {
    const preview = await previewHistoryFile(history);
    expect(() => v.parse(HISTORY_REQUESTS.previewHistory.result, preview)).not.toThrow();
    expect(preview.detection.layout).toBe('bts');
  });
});
