// The user's own posterior bundles, kept in one folder: add a fitted bundle, list them with
// their provenance, choose the one in use ("use this bundle") and switch back to the default.
//
// Files are written atomically; a corrupt or foreign file in the folder is listed as unreadable
// with its reason, never silently dropped and never fatal to the rest of the list.
import { mkdir, readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { libraryEntryOf, sortEntries, type ActiveBundle, type BundleStore, type LibraryEntry, type UnreadableEntry } from '../../shared/history/bundle-store';
import { validateBundle, type PosteriorBundle } from '../../shared/delay/bundle/bundle-schema';
import { writeFileAtomic } from '../workspace/atomic-write';

export type { ActiveBundle, LibraryEntry, UnreadableEntry } from '../../shared/history/bundle-store';

const ACTIVE_FILE = 'active.json';

function fileNameFor(id: string): string {
  return `${id.replace(/[^A-Za-z0-9._-]/g, '_')}.json`;
}

export class BundleLibrary implements BundleStore {
  constructor(readonly folder: string) {}

  /** Validates and stores a bundle under its id (replacing one with the same id); returns its entry. */
  async add(bundle: unknown): Promise<LibraryEntry> {
    const valid = validateBundle(bundle);
    const file = path.join(this.folder, fileNameFor(valid.id));
    await mkdir(this.folder, { recursive: true });
    await writeFileAtomic(file, JSON.stringify(valid));
    return libraryEntryOf(valid, file, (await this.activeId()) === valid.id);
  }

  /** Every bundle in the folder, newest first, plus the files that could not be read and why. */
  async list(): Promise<{ entries: LibraryEntry[]; unreadable: UnreadableEntry[] }> {
    let names: string[];
    try {
      names = (await readdir(this.folder)).filter((n) => n.endsWith('.json') && n !== ACTIVE_FILE);
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return { entries: [], unreadable: [] };
      throw err;
    }
    const activeId = await this.activeId();
    const entries: LibraryEntry[] = [];
    const unreadable: UnreadableEntry[] = [];
    for (const name of names.sort()) {
      const file = path.join(this.folder, name);
      try {
        const bundle = validateBundle(JSON.parse(await readFile(file, 'utf8')));
        entries.push(libraryEntryOf(bundle, file, bundle.id === activeId));
      } catch (err) {
        unreadable.push({ file, reason: err instanceof Error ? err.message : String(err) });
      }
    }
    return { entries: sortEntries(entries), unreadable };
  }

  /** The bundle with this id; throws an Error naming the id when there is none. */
  async load(id: string): Promise<PosteriorBundle> {
    const file = path.join(this.folder, fileNameFor(id));
    let text: string;
    try {
      text = await readFile(file, 'utf8');
    } catch {
      throw new Error(`no bundle '${id}' in ${this.folder}`);
    }
    const bundle = validateBundle(JSON.parse(text));
    if (bundle.id !== id) throw new Error(`${file} holds bundle '${bundle.id}', not '${id}'`);
    return bundle;
  }

  /** Chooses the bundle in use; a library id must exist and load. */
  async use(choice: ActiveBundle): Promise<void> {
    if (choice.kind === 'library') await this.load(choice.id);
    await mkdir(this.folder, { recursive: true });
    await writeFileAtomic(path.join(this.folder, ACTIVE_FILE), JSON.stringify(choice));
  }

  /** The bundle in use; the default when nothing was chosen or the chosen one is gone. */
  async active(): Promise<ActiveBundle> {
    const id = await this.activeId();
    return id === null ? { kind: 'default' } : { kind: 'library', id };
  }

  private async activeId(): Promise<string | null> {
    try {
      const value = JSON.parse(await readFile(path.join(this.folder, ACTIVE_FILE), 'utf8')) as { kind?: unknown; id?: unknown };
      if (value.kind !== 'library' || typeof value.id !== 'string') return null;
      await this.load(value.id);
      return value.id;
    } catch {
      return null;
    }
  }
}
