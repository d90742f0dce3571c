// The user's own posterior bundles as the app sees them: add a fitted bundle, list them with
// their provenance, load one, and choose the one in use or go back to the bundle that ships.
// main/history/bundle-library.ts keeps them in a folder; the page's worker keeps them here,
// in memory, for as long as the page is open.
import type { BundleView } from '../api/analysis-schema';
import { bundleView } from '../api/bundle-view';
import { validateBundle, type PosteriorBundle } from '../delay/bundle/bundle-schema';
import { createBundleSource } from '../delay/bundle/posterior-source';

/** The bundle in use: a library id, or the bundle that ships with the app. */
export type ActiveBundle = { readonly kind: 'default' } | { readonly kind: 'library'; readonly id: string };

export interface LibraryEntry {
  readonly id: string;
  /** Where it is kept: a file path, or a note for bundles held in memory. */
  readonly file: string;
  readonly active: boolean;
  readonly view: BundleView;
  readonly createdAt: string;
  /** 'fitted' when departure delays were fitted directly, 'derived' otherwise. */
  readonly departures: 'fitted' | 'derived';
  /** The held-out scores stored in the bundle (e.g. the last month of the user's history). */
  readonly heldOut: readonly { readonly candidate: string; readonly split: string; readonly flights: number; readonly natsPerFlight: number }[];
}

export interface UnreadableEntry {
  readonly file: string;
  readonly reason: string;
}

export interface BundleStore {
  /** Validates and stores a bundle under its id (replacing one with the same id); returns its entry. */
  add(bundle: unknown): Promise<LibraryEntry>;
  /** Every bundle, newest first, plus those that could not be read and why. */
  list(): Promise<{ entries: LibraryEntry[]; unreadable: UnreadableEntry[] }>;
  /** The bundle with this id; throws an Error naming the id when there is none. */
  load(id: string): Promise<PosteriorBundle>;
  /** Chooses the bundle in use; a library id must exist and load. */
  use(choice: ActiveBundle): Promise<void>;
  /** The bundle in use; the default when nothing was chosen or the chosen one is gone. */
  active(): Promise<ActiveBundle>;
}

export function libraryEntryOf(bundle: PosteriorBundle, file: string, active: boolean): LibraryEntry {
  return {
    id: bundle.id,
    file,
    active,
    view: bundleView(createBundleSource(bundle, { drawCount: 1, isKnownAirport: () => true })),
    createdAt: bundle.metadata.createdAt,
    departures: bundle.departure.fitted !== undefined ? 'fitted' : 'derived',
    heldOut: bundle.metadata.comparison.map((c) => ({ candidate: c.candidate, split: c.split, flights: c.flights, natsPerFlight: c.natsPerFlight })),
  };
}

/** Newest first; ties by id, so the order is stable. */
export function sortEntries(entries: LibraryEntry[]): LibraryEntry[] {
  return entries.sort((a, b) => (a.createdAt < b.createdAt ? 1 : a.createdAt > b.createdAt ? -1 : a.id < b.id ? -1 : 1));
}

/** Bundles held in memory: the page's library, gone when the page closes. */
export function createMemoryBundleStore(where = 'kept in this page until it is closed'): BundleStore {
  const bundles = new Map<string, PosteriorBundle>();
  let activeId: string | null = null;
  const load = async (id: string): Promise<PosteriorBundle> => {
    const bundle = bundles.get(id);
    if (!bundle) throw new Error(`no bundle '${id}' in this page's library`);
    return bundle;
  };
  return {
    add: async (bundle) => {
      const valid = validateBundle(bundle);
      bundles.set(valid.id, valid);
      return libraryEntryOf(valid, where, valid.id === activeId);
    },
    list: async () => ({ entries: sortEntries([...bundles.values()].map((b) => libraryEntryOf(b, where, b.id === activeId))), unreadable: [] }),
    load,
    use: async (choice) => {
      if (choice.kind === 'library') await load(choice.id);
      activeId = choice.kind === 'library' ? choice.id : null;
    },
    active: async () => (activeId === null ? { kind: 'default' } : { kind: 'library', id: activeId }),
  };
}
