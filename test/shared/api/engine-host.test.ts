// The engine host's scoring hook (shared/api/engine-host.ts): a host that scores on more threads
// passes its own scorer, which is told the bundle choice the source was loaded for.
import { describe, expect, it } from 'vitest';
import { createEngineHost } from '../../../shared/api/engine-host';
import type { LoadedChoice } from '../../../shared/api/history-handlers';
import { createMemoryBundleStore } from '../../../shared/history/bundle-store';
import { scoreTrips } from '../../../shared/risk/score-trips';
import { DEFAULT_ANALYSIS_SETTINGS } from '../../../shared/workspace/settings';
import { DEMO_TRIPS_TEXT } from '../../../shared/demo/demo-workspace';
import { previewHistoryRef, readHistoryRef } from '../../../main/history/history-file-refs';
import { syntheticSource } from '../../fixtures/risk/synthetic-source';

const host = { version: '1', runtime: 'web' as const, platform: 'test' };

describe('createEngineHost with its own scorer', () => {
  it('scores through it, told the choice the source was loaded for, with scoreTrips\'s numbers', async () => {
    const source = syntheticSource({ draws: 16 });
    const calls: (LoadedChoice | undefined)[] = [];
    const common = { host, store: createMemoryBundleStore(), previewHistory: previewHistoryRef, readHistory: readHistoryRef, nowMs: () => 0, loadDefault: async () => source };
    const hooked = createEngineHost({
      ...common,
      scoreTrips: async (parsed, s, options, loaded) => {
        calls.push(loaded);
        return scoreTrips(parsed, s, options);
      },
    });
    const plain = createEngineHost({ ...common, store: createMemoryBundleStore() });
    const a = await hooked.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    const b = await plain.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS);
    expect(calls).toEqual([{ choice: { kind: 'default' }, generation: 0 }]);
    expect(a.trips).toEqual(b.trips);
    expect(a.group).toEqual(b.group);
  });

  it('returns the scorer\'s failure as the analysis\'s', async () => {
    const handlers = createEngineHost({
      host, store: createMemoryBundleStore(), previewHistory: previewHistoryRef, readHistory: readHistoryRef, nowMs: () => 0,
      loadDefault: async () => syntheticSource({ draws: 16 }),
      scoreTrips: async () => {
        throw new Error('helper gone');
      },
    });
    await expect(handlers.analyzeTrips(DEMO_TRIPS_TEXT, DEFAULT_ANALYSIS_SETTINGS)).rejects.toThrow(/helper gone/);
  });
});
