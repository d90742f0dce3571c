// The page's bundle library: fitted bundles kept in the browser's IndexedDB (from the engine's
// Web Worker), so they and the choice of bundle survive a reload, as the desktop app's folder
// does. Each record is validated when read; one that no longer validates is listed as
// unreadable with its reason, never dropped silently.
import { validateBundle, type PosteriorBundle } from '../../shared/delay/bundle/bundle-schema';
import { libraryEntryOf, sortEntries, type ActiveBundle, type BundleStore, type LibraryEntry, type UnreadableEntry } from '../../shared/history/bundle-store';

const DB_NAME = 'layline-bundles';
const BUNDLES = 'bundles';
const SETTINGS = 'settings';
const ACTIVE_KEY = 'active';
const WHERE = "this browser's storage for the page (the desktop app keeps bundles on disk)";

function promised<T>(request: IDBRequest<T>): Promise<T> {
  return new Promise((resolve, reject) => {
    request.onsuccess = () => resolve(request.result);
    request.onerror = () => reject(request.error ?? new Error('IndexedDB request failed'));
  });
}

function done(tx: IDBTransaction): Promise<void> {
  return new Promise((resolve, reject) => {
    tx.oncomplete = () => resolve();
    tx.onerror = () => reject(tx.error ?? new Error('IndexedDB transaction failed'));
    tx.onabort = () => reject(tx.error ?? new Error('IndexedDB transaction aborted'));
  });
}

function openDatabase(factory: IDBFactory): Promise<IDBDatabase> {
  const request = factory.open(DB_NAME, 1);
  request.onupgradeneeded = () => {
    request.result.createObjectStore(BUNDLES);
    request.result.createObjectStore(SETTINGS);
  };
  return promised(request);
}

export function createIndexedDbBundleStore(factory: IDBFactory = indexedDB): BundleStore {
  let db: Promise<IDBDatabase> | null = null;
  const database = () => {
    db ??= openDatabase(factory).catch((err: unknown) => {
      db = null;
      throw new Error(`the page cannot keep bundles: IndexedDB is unavailable (${err instanceof Error ? err.message : String(err)})`);
    });
    return db;
  };

  const readText = async (id: string): Promise<string | undefined> => {
    const tx = (await database()).transaction(BUNDLES, 'readonly');
    return (await promised(tx.objectStore(BUNDLES).get(id))) as string | undefined;
  };

  const load = async (id: string): Promise<PosteriorBundle> => {
    const text = await readText(id);
    if (text === undefined) throw new Error(`no bundle '${id}' in this page's library`);
    return validateBundle(JSON.parse(text));
  };

  const activeId = async (): Promise<string | null> => {
    const tx = (await database()).transaction(SETTINGS, 'readonly');
    const value = (await promised(tx.objectStore(SETTINGS).get(ACTIVE_KEY))) as unknown;
    if (typeof value !== 'string') return null;
    try {
      await load(value);
      return value;
    } catch {
      return null; // the chosen bundle is gone or damaged: score with the default
    }
  };

  return {
    add: async (bundle) => {
      const valid = validateBundle(bundle);
      const tx = (await database()).transaction(BUNDLES, 'readwrite');
      tx.objectStore(BUNDLES).put(JSON.stringify(valid), valid.id);
      await done(tx);
      return libraryEntryOf(valid, WHERE, (await activeId()) === valid.id);
    },
    list: async () => {
      const tx = (await database()).transaction(BUNDLES, 'readonly');
      const store = tx.objectStore(BUNDLES);
      const [keys, texts] = await Promise.all([promised(store.getAllKeys()), promised(store.getAll())]);
      const current = await activeId();
      const entries: LibraryEntry[] = [];
      const unreadable: UnreadableEntry[] = [];
      keys.forEach((key, i) => {
        try {
          const bundle = validateBundle(JSON.parse(String(texts[i])));
          entries.push(libraryEntryOf(bundle, WHERE, bundle.id === current));
        } catch (err) {
          unreadable.push({ file: `${WHERE}: ${String(key)}`, reason: err instanceof Error ? err.message : String(err) });
        }
      });
      return { entries: sortEntries(entries), unreadable };
    },
    load,
    use: async (choice: ActiveBundle) => {
      if (choice.kind === 'library') await load(choice.id);
      const tx = (await database()).transaction(SETTINGS, 'readwrite');
      if (choice.kind === 'library') tx.objectStore(SETTINGS).put(choice.id, ACTIVE_KEY);
      else tx.objectStore(SETTINGS).delete(ACTIVE_KEY);
      await done(tx);
    },
    active: async () => {
      const id = await activeId();
      return id === null ? { kind: 'default' } : { kind: 'library', id };
    },
  };
}
