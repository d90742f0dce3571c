// The desktop app's open workspace: which file it belongs to, and the open, save, import,
// autosave and recovery steps, with Node's file system and no Electron.
//
// The page never names a file to write: saves go to the path this session chose through a
// dialog, and opening by path is allowed only for recent documents and files the OS passed in.
import { readFile, stat } from 'node:fs/promises';
import path from 'node:path';
import type { OpenedWorkspace, RecoveryOffer, SavedWorkspace } from '../../shared/api/contract';
import type { WorkspaceContent } from '../../shared/workspace/format';
import { WORKSPACE_EXTENSION } from '../../shared/workspace/format';
import { AutosaveStore } from './autosave';
import { RecentDocuments } from './recent-documents';
import { readWorkspaceFile, writeWorkspaceFile } from './workspace-files';

/** Trip files above this size are refused (about 50,000 legs). */
export const MAX_TRIPS_FILE_BYTES = 5_000_000;

function messageOf(err: unknown): string {
  return err instanceof Error ? err.message : String(err);
}

export class WorkspaceSession {
  private currentPath: string | null = null;
  private readonly grantedPaths = new Set<string>();
  readonly recent: RecentDocuments;
  readonly autosave: AutosaveStore;

  constructor(
    dataDir: string,
    private readonly now: () => Date = () => new Date(),
  ) {
    this.recent = new RecentDocuments(dataDir);
    this.autosave = new AutosaveStore(dataDir);
  }

  get filePath(): string | null {
    return this.currentPath;
  }

  /** A file the OS asked us to open (double-click, command line, macOS open-file). */
  grantPath(filePath: string): void {
    this.grantedPaths.add(path.resolve(filePath));
  }

  async mayOpen(filePath: string): Promise<boolean> {
    const resolved = path.resolve(filePath);
    return this.grantedPaths.has(resolved) || (await this.recent.list()).includes(resolved);
  }

  async open(filePath: string): Promise<OpenedWorkspace> {
    const resolved = path.resolve(filePath);
    try {
      const read = await readWorkspaceFile(resolved);
      this.currentPath = resolved;
      await this.recent.add(resolved);
      return { status: 'opened', filePath: resolved, savedAt: read.savedAt, content: read.content };
    } catch (err) {
      return { status: 'failed', filePath: resolved, message: messageOf(err) };
    }
  }

  /** Saves to `target`, or to the current file when target is null. */
  async save(content: WorkspaceContent, target: string | null): Promise<SavedWorkspace> {
    const chosen = target ?? this.currentPath;
    if (!chosen) return { status: 'failed', filePath: '', message: 'There is no file to save to; choose Save As.' };
    const resolved = path.resolve(path.extname(chosen) ? chosen : `${chosen}.${WORKSPACE_EXTENSION}`);
    try {
      await writeWorkspaceFile(resolved, content, this.now());
    } catch (err) {
      return { status: 'failed', filePath: resolved, message: messageOf(err) };
    }
    this.currentPath = resolved;
    await this.recent.add(resolved).catch(() => undefined);
    await this.autosave.clear().catch(() => undefined);
    return { status: 'saved', filePath: resolved };
  }

  reset(): void {
    this.currentPath = null;
  }

  async importTrips(filePath: string): Promise<{ status: 'imported'; name: string; text: string } | { status: 'failed'; message: string }> {
    try {
      const info = await stat(filePath);
      if (info.size > MAX_TRIPS_FILE_BYTES) return { status: 'failed', message: `${filePath} is ${Math.round(info.size / 1e6)} MB; Layline reads trip files up to 5 MB.` };
      return { status: 'imported', name: path.basename(filePath), text: await readFile(filePath, 'utf8') };
    } catch (err) {
      return { status: 'failed', message: `Could not read ${filePath}: ${messageOf(err)}` };
    }
  }

  async writeAutosave(content: WorkspaceContent): Promise<void> {
    await this.autosave.write(content, this.currentPath, this.now());
  }

  /** Unsaved work the last session left, once; a damaged recovery file is left on disk and reported as none. */
  async takeRecovery(): Promise<RecoveryOffer> {
    const read = await this.autosave.read();
    if (read.kind !== 'found') return null;
    if (read.recovery.sourcePath) this.grantPath(read.recovery.sourcePath);
    return { savedAt: read.recovery.savedAt, sourcePath: read.recovery.sourcePath, content: read.recovery.content };
  }
}
