// Autosave and crash recovery: the open workspace is written to the app's data folder a
// few seconds after each change, and removed when the user saves or closes cleanly. A
// recovery file still present at the next start means the last session ended with
// unsaved work, which is then offered back.
import { mkdir, readFile, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import * as v from 'valibot';
import { WorkspaceContentSchema, type WorkspaceContent } from '../../shared/workspace/format';
import { writeFileAtomic } from './atomic-write';

const RecoverySchema = v.strictObject({
  format: v.literal('layline-recovery'),
  version: v.literal(1),
  savedAt: v.pipe(v.string(), v.isoTimestamp()),
  /** The workspace file the work belongs to, or null for an unsaved workspace. */
  sourcePath: v.nullable(v.string()),
  content: WorkspaceContentSchema,
});
export type Recovery = v.InferOutput<typeof RecoverySchema>;

export type RecoveryRead = { readonly kind: 'none' } | { readonly kind: 'found'; readonly recovery: Recovery } | { readonly kind: 'unreadable'; readonly file: string; readonly message: string };

export class AutosaveStore {
  readonly file: string;

  constructor(dataDir: string) {
    this.file = path.join(dataDir, 'autosave', 'recovery.json');
  }

  async write(content: WorkspaceContent, sourcePath: string | null, now: Date): Promise<void> {
    await mkdir(path.dirname(this.file), { recursive: true });
    const record: Recovery = { format: 'layline-recovery', version: 1, savedAt: now.toISOString(), sourcePath, content };
    await writeFileAtomic(this.file, JSON.stringify(record) + '\n');
  }

  /**
   * What the last session left behind. A damaged recovery file is moved aside to
   * `recovery.damaged-<time>.json` (so the next autosave cannot overwrite it) and reported.
   */
  async read(): Promise<RecoveryRead> {
    const found = await this.readInPlace();
    if (found.kind !== 'unreadable') return found;
    const aside = this.file.replace(/\.json$/, `.damaged-${Date.now()}.json`);
    try {
      await rename(this.file, aside);
      return { ...found, file: aside };
    } catch {
      return found;
    }
  }

  private async readInPlace(): Promise<RecoveryRead> {
    let text: string;
    try {
      text = await readFile(this.file, 'utf8');
    } catch (err) {
      if ((err as NodeJS.ErrnoException).code === 'ENOENT') return { kind: 'none' };
      return { kind: 'unreadable', file: this.file, message: err instanceof Error ? err.message : String(err) };
    }
    try {
      const parsed = v.safeParse(RecoverySchema, JSON.parse(text));
      if (parsed.success) return { kind: 'found', recovery: parsed.output };
      return { kind: 'unreadable', file: this.file, message: `the recovery file is damaged (${parsed.issues[0]?.message ?? 'invalid'})` };
    } catch (err) {
      return { kind: 'unreadable', file: this.file, message: `the recovery file is damaged (${err instanceof Error ? err.message : String(err)})` };
    }
  }

  async clear(): Promise<void> {
    await rm(this.file, { force: true });
  }
}
