// The list of recently opened workspaces, newest first, kept in the app's data folder.
import { mkdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import * as v from 'valibot';
import { writeFileAtomic } from './atomic-write';

export const MAX_RECENT = 10;

const RecentSchema = v.strictObject({ version: v.literal(1), paths: v.array(v.string()) });

/** Puts `filePath` first, drops an older entry for the same file, keeps at most MAX_RECENT. */
export function addRecent(list: readonly string[], filePath: string): string[] {
  return [filePath, ...list.filter((p) => p !== filePath)].slice(0, MAX_RECENT);
}

export class RecentDocuments {
  private readonly file: string;

  constructor(dataDir: string) {
    this.file = path.join(dataDir, 'recent-workspaces.json');
  }

  /** The stored list; a missing or damaged list reads as empty (it is only a convenience). */
  async list(): Promise<string[]> {
    try {
      const parsed = v.safeParse(RecentSchema, JSON.parse(await readFile(this.file, 'utf8')));
      return parsed.success ? parsed.output.paths.slice(0, MAX_RECENT) : [];
    } catch {
      return [];
    }
  }

  async add(filePath: string): Promise<string[]> {
    const next = addRecent(await this.list(), filePath);
    await this.store(next);
    return next;
  }

  async remove(filePath: string): Promise<string[]> {
    const next = (await this.list()).filter((p) => p !== filePath);
    await this.store(next);
    return next;
  }

  private async store(paths: string[]): Promise<void> {
    await mkdir(path.dirname(this.file), { recursive: true });
    await writeFileAtomic(this.file, JSON.stringify({ version: 1, paths }) + '\n');
  }
}
