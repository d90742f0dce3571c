// The history requests through the validated contract, as the page calls them: preview a
// generated file in the public on-time (BTS) layout, fit it as a job while polling its
// progress, save the bundle, score with it, and switch back to the default.
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeSyntheticBtsCsv } from '../../../main/history/synthetic-history';
import { createApiClient } from '../../../shared/api/client';
import type { LaylineApi } from '../../../shared/api/contract';
import { serveRequest } from '../../../shared/api/server';
import { createBundleSelection } from '../../../shared/api/history-handlers';
import { dayNumber } from '../../../shared/history/cells';
import { createMemoryBundleStore } from '../../../shared/history/bundle-store';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { testEngineHost } from '../../fixtures/api/test-engine-host';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

let dir: string;
let history: string;
let api: LaylineApi;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-history-api-'));
  history = path.join(dir, 'history.csv');
  // The generator's first three airports are ORD, ATL and DFW (main/history/synthetic-history.ts).
  await writeSyntheticBtsCsv(history, { rows: 6000, seed: 21, firstDay: dayNumber(2024, 3, 1), days: 61, airports: 3, cancelledShare: 0.02, divertedShare: 0.01 });
  const handlers = testEngineHost({ version: '1', runtime: 'web', platform: 'test' });
  api = createApiClient((channel, args) => serveRequest(handlers, channel, args));
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

async function until<T>(poll: () => Promise<T>, done: (t: T) => boolean, timeoutMs = 60_000): Promise<{ last: T; seen: T[] }> {
  const seen: T[] = [];
  const t0 = Date.now();
  for (;;) {
    const last = await poll();
    seen.push(last);
    if (done(last)) return { last, seen };
    if (Date.now() - t0 > timeoutMs) throw new Error('timed out waiting');
    await new Promise((r) => setTimeout(r, 20));
  }
}

describe('history requests', () => {
  it('previews, fits with progress, saves, scores with the new bundle and switches back', async () => {
    const preview = await api.previewHistory({ kind: 'path', path: history });
    expect(preview.detection.layout).toBe('bts');
    expect(preview.detection.missing).toEqual([]);
    expect(preview.sampleRows.length).toBe(5);

    const before = await api.getBundleInfo();
    const { jobId } = await api.startHistoryFit({ source: { kind: 'path', path: history }, holdoutAfter: '2024-04-15' });
    const { last, seen } = await until(() => api.historyFitStatus(jobId), (s) => s.state !== 'reading' && s.state !== 'fitting');
    expect(last.state).toBe('done');
    // Progress only moves forward, and the trace carries the objective for the live chart.
    const fractions = seen.map((s) => s.fraction);
    expect(fractions).toEqual([...fractions].sort((a, b) => a - b));
    expect(last.trace.length).toBeGreaterThan(3);
    expect(last.summary!.holdout.holdoutAfter).toBe('2024-04-15');
    expect(last.summary!.import.cancelled).toBeGreaterThan(0);
    expect(last.summary!.heldOut.arrival.baseline?.name).toContain(before.bundle!.id);

    // Nothing changes until the user says so.
    expect((await api.listBundles()).entries).toEqual([]);
    const entry = await api.saveFittedBundle(jobId);
    expect((await api.getBundleInfo()).bundle!.id).toBe(before.bundle!.id);
    await expect(api.useBundle({ kind: 'library', id: entry.id })).resolves.toEqual({ kind: 'library', id: entry.id });
    const listed = await api.listBundles();
    expect(listed.active).toEqual({ kind: 'library', id: entry.id });
    expect(listed.entries.map((e) => [e.id, e.active])).toEqual([[entry.id, true]]);

    const analysis = await api.analyzeTrips('traveler,trip,flight,from,depart,to,arrive\nAda,T,UA 1,ORD,2026-03-08 15:10,ATL,18:05\nAda,T,UA 2,ATL,2026-03-08 19:10,DFW,20:40\n', DEFAULT_ANALYSIS_SETTINGS);
    expect(analysis.bundle?.id).toBe(entry.id);
    expect(analysis.trips[0]?.connections[0]?.pMake).toBeGreaterThan(0);

    await api.useBundle({ kind: 'default' });
    expect((await api.getBundleInfo()).bundle!.id).toBe(before.bundle!.id);
  }, 120_000);

  it('leaves the bundle in use alone when a fit is cancelled', async () => {
    const before = await api.getBundleInfo();
    const { jobId } = await api.startHistoryFit({ source: { kind: 'path', path: history } });
    await expect(api.cancelHistoryFit(jobId)).resolves.toBe(true);
    const { last } = await until(() => api.historyFitStatus(jobId), (s) => s.state !== 'reading' && s.state !== 'fitting');
    expect(last.state).toBe('cancelled');
    await expect(api.saveFittedBundle(jobId)).rejects.toThrow(/no bundle to save/);
    expect((await api.getBundleInfo()).bundle!.id).toBe(before.bundle!.id);
  });

  it('rejects a choice of a bundle that is not in the library', async () => {
    await expect(api.useBundle({ kind: 'library', id: 'nothing-here' })).rejects.toThrow(/no bundle 'nothing-here'/);
  });
});

describe('createBundleSelection', () => {
  it('loads the choice once per change and tries again after a failed load', async () => {
    let loads = 0;
    let fail = true;
    const source = syntheticSource({ draws: 4 });
    const selection = createBundleSelection(createMemoryBundleStore(), async () => {
      loads++;
      if (fail) throw new Error('not yet');
      return source;
    });
    await expect(selection.load()).rejects.toThrow('not yet');
    fail = false;
    await expect(selection.load()).resolves.toBe(source);
    await selection.load();
    expect(loads).toBe(2);
    await selection.choose({ kind: 'default' });
    expect(selection.generation()).toBe(1);
    await selection.load();
    expect(loads).toBe(3);
  });

  it('tells which choice, at which generation, a loaded source was loaded for', async () => {
    const first = syntheticSource({ draws: 4 });
    const second = syntheticSource({ draws: 4 });
    let next = first;
    const selection = createBundleSelection(createMemoryBundleStore(), async () => next);
    expect(await selection.load()).toBe(first);
    expect(selection.loadedFor(first)).toEqual({ choice: { kind: 'default' }, generation: 0 });
    next = second;
    await selection.choose({ kind: 'default' });
    expect(await selection.load()).toBe(second);
    expect(selection.loadedFor(second)).toEqual({ choice: { kind: 'default' }, generation: 1 });
    expect(selection.loadedFor(syntheticSource())).toBeUndefined();
  });
});
