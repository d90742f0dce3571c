// The desktop app's engine host for real: the built dist/main/engine-thread.cjs in a Node
// worker thread, driven through the main process's client. History is read by path, fitted
// bundles land in the folder given as workerData, and the choice of bundle survives a restart.
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createThreadEngine } from '../../main/electron/engine-thread-client';
import { writeSyntheticBtsCsv } from '../../main/history/synthetic-history';
import { dayNumber } from '../../shared/history/cells';

const THREAD = path.resolve(__dirname, '../../dist/main/engine-thread.cjs');
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
});
