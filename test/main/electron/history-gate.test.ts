// The desktop engine reads only history files the user picked in the native dialog.
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { HistoryFileGate } from '../../../main/electron/history-gate';
import type { HistoryHandlers } from '../../../shared/api/history-handlers';

let dir: string;
let file: string;
const TEXT = 'FlightDate,Origin,Dest,ArrDelay\n2024-05-01,ORD,BOS,3\n';
beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-gate-'));
  file = path.join(dir, 'history.csv');
  await writeFile(file, TEXT);
});
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

function fakeHistory(): HistoryHandlers {
  return {
    previewHistory: vi.fn(async () => ({ format: 'csv' as const, detection: { header: [], mapping: {}, missing: [], layout: 'other' as const }, sampleRows: [] })),
    startHistoryFit: vi.fn(async () => ({ jobId: 'fit-1' })),
    historyFitStatus: vi.fn(),
    cancelHistoryFit: vi.fn(),
    saveFittedBundle: vi.fn(),
    listBundles: vi.fn(),
    useBundle: vi.fn(),
  } as unknown as HistoryHandlers; // only the two gated requests are called here
}

describe('HistoryFileGate', () => {
  it('describes a chosen file and lets the engine read it, by the same path spelled differently too', async () => {
    const gate = new HistoryFileGate();
    const chosen = await gate.grant(file);
    expect(chosen).toEqual({ status: 'chosen', path: file, name: 'history.csv', bytes: Buffer.byteLength(TEXT) });
    const inner = fakeHistory();
    const guarded = gate.guard(inner);
    await guarded.previewHistory({ kind: 'path', path: path.join(dir, '.', 'history.csv') });
    await guarded.startHistoryFit({ source: { kind: 'path', path: file } });
    expect(inner.previewHistory).toHaveBeenCalledTimes(1);
    expect(inner.startHistoryFit).toHaveBeenCalledTimes(1);
  });

  it('refuses a path the dialog did not return, before the engine sees it', async () => {
    const gate = new HistoryFileGate();
    await gate.grant(file);
    const inner = fakeHistory();
    const guarded = gate.guard(inner);
    await expect(guarded.previewHistory({ kind: 'path', path: '/etc/passwd' })).rejects.toThrow(/was not chosen in the file dialog/);
    await expect(guarded.startHistoryFit({ source: { kind: 'path', path: path.join(dir, 'other.csv') } })).rejects.toThrow(/was not chosen/);
    expect(inner.previewHistory).not.toHaveBeenCalled();
    expect(inner.startHistoryFit).not.toHaveBeenCalled();
  });

  it('refuses a browser file reference in the desktop app', async () => {
    const guarded = new HistoryFileGate().guard(fakeHistory());
    await expect(guarded.previewHistory({ kind: 'blob', name: 'x.csv', blob: new Blob(['a']) })).rejects.toThrow(/reads delay history by path/);
  });
});
