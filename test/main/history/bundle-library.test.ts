import { mkdir, mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BundleLibrary } from '../../../main/history/bundle-library';
import { readHistoryFile } from '../../../main/history/read-history-file';
import { writeSyntheticBtsCsv } from '../../../main/history/synthetic-history';
import type { PosteriorBundle } from '../../../shared/delay/bundle/bundle-schema';
import { dayNumber } from '../../../shared/history/cells';
import { fitRouteHistory } from '../../../shared/history/history-fit';

let dir: string;
let bundle: PosteriorBundle;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), 'layline-library-'));
  const file = path.join(dir, 'h.csv');
  await writeSyntheticBtsCsv(file, { rows: 6000, seed: 3, firstDay: dayNumber(2024, 3, 1), days: 61, airports: 2, disruptedWeight: 0 });
  const { table } = await readHistoryFile(file);
  const result = await fitRouteHistory(table, {
    method: 'map',
    seed: 1,
    candidate: { name: 'gumbel', family: 'gumbel', monthEffects: [], description: 'one Gumbel per route' },
    metadata: { id: 'team-history-2024', title: 'Team history', source: 'h.csv', license: "the user's own data", createdAt: '2026-11-30T10:00:00.000Z' },
    evaluationDraws: 10,
  });
  bundle = result.bundle;
}, 60_000);
afterAll(async () => {
  await rm(dir, { recursive: true, force: true });
});

describe('BundleLibrary', () => {
  it('lists an added bundle with its provenance and held-out scores', async () => {
    const library = new BundleLibrary(path.join(dir, 'lib'));
    expect(await library.list()).toEqual({ entries: [], unreadable: [] });
    await mkdir(library.folder);
    const entry = await library.add(bundle);
    expect(entry).toMatchObject({ id: 'team-history-2024', active: false, departures: 'fitted', createdAt: '2026-11-30T10:00:00.000Z' });
    expect(entry.view.provenance).toMatchObject({ title: 'Team history', license: "the user's own data", dateFirst: '2024-03-01' });
    expect(entry.heldOut.map((h) => h.candidate)).toEqual(['gumbel (arrival delays)', 'gumbel (departure delays)']);
    const { entries } = await library.list();
    expect(entries.map((e) => e.id)).toEqual(['team-history-2024']);
  });

  it('switches to a library bundle and back to the default', async () => {
    const library = new BundleLibrary(path.join(dir, 'lib'));
    expect(await library.active()).toEqual({ kind: 'default' });
    await library.use({ kind: 'library', id: 'team-history-2024' });
    expect(await library.active()).toEqual({ kind: 'library', id: 'team-history-2024' });
    expect((await library.list()).entries[0]!.active).toBe(true);
    await library.use({ kind: 'default' });
    expect(await library.active()).toEqual({ kind: 'default' });
  });

  it('refuses to use a bundle it does not have, and refuses an invalid bundle', async () => {
    const library = new BundleLibrary(path.join(dir, 'lib'));
    await expect(library.use({ kind: 'library', id: 'nope' })).rejects.toThrow(/no bundle 'nope'/);
    await expect(library.add({ format: 'something else' })).rejects.toThrow(/not a valid route-posterior bundle/);
  });

  it('lists a corrupt file as unreadable with its reason and keeps the others', async () => {
    const library = new BundleLibrary(path.join(dir, 'lib'));
    await writeFile(path.join(library.folder, 'broken.json'), '{"format": "layline.route-posteriors", "version": 1');
    const { entries, unreadable } = await library.list();
    expect(entries).toHaveLength(1);
    expect(unreadable).toEqual([expect.objectContaining({ file: path.join(library.folder, 'broken.json'), reason: expect.stringMatching(/JSON/) })]);
  });
});
