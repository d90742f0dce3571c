// Opening and saving workspace files on disk, with the rules that protect the user's data:
// saves are atomic and keep a backup, and a file that is not a readable workspace is
// never overwritten.
import { readFile, stat } from 'node:fs/promises';
import { parseWorkspace, serializeWorkspace, WorkspaceReadError, type ReadWorkspace, type WorkspaceContent, MAX_TRIPS_TEXT_CHARS } from '../../shared/workspace/format';
import { writeFileAtomic, type AtomicWriteFs } from './atomic-write';

/** A workspace file over this size is refused before it is read. */
const MAX_FILE_BYTES = MAX_TRIPS_TEXT_CHARS * 2 + 1_000_000;

export class WorkspaceFileError extends Error {
  constructor(
    readonly filePath: string,
    message: string,
    readonly kind: WorkspaceReadError['kind'] | 'io' | 'too-large' | 'would-overwrite',
  ) {
    super(message);
    this.name = 'WorkspaceFileError';
  }
}

export async function readWorkspaceFile(filePath: string): Promise<ReadWorkspace> {
  let text: string;
  try {
    const info = await stat(filePath);
    if (info.size > MAX_FILE_BYTES) throw new WorkspaceFileError(filePath, `${filePath} is ${Math.round(info.size / 1e6)} MB, too large for a Layline workspace.`, 'too-large');
    text = await readFile(filePath, 'utf8');
  } catch (err) {
    if (err instanceof WorkspaceFileError) throw err;
    throw new WorkspaceFileError(filePath, `Could not read ${filePath}: ${err instanceof Error ? err.message : String(err)}`, 'io');
  }
  try {
    return parseWorkspace(text);
  } catch (err) {
    if (err instanceof WorkspaceReadError) throw new WorkspaceFileError(filePath, `${filePath}: ${err.message} The file was left as it is.`, err.kind);
    throw err;
  }
}

/**
 * Saves a workspace atomically, keeping the previous copy as `<file>.bak`.
 *
 * When a file already sits at the path and it is not a readable Layline workspace, the
 * save is refused: it may be a damaged workspace the user still wants to rescue, or an
 * unrelated file picked by mistake.
 */
export async function writeWorkspaceFile(filePath: string, content: WorkspaceContent, now: Date, fs?: AtomicWriteFs): Promise<void> {
  let existing: string | null = null;
  try {
    existing = await readFile(filePath, 'utf8');
  } catch (err) {
    if ((err as NodeJS.ErrnoException).code !== 'ENOENT') {
      throw new WorkspaceFileError(filePath, `Could not check ${filePath} before saving: ${err instanceof Error ? err.message : String(err)}`, 'io');
    }
  }
  if (existing !== null) {
    try {
      parseWorkspace(existing);
    } catch (err) {
      if (!(err instanceof WorkspaceReadError)) throw err;
      throw new WorkspaceFileError(filePath, `Not saved: ${filePath} exists and is not a readable Layline workspace (${err.message}) Layline will not overwrite it; choose Save As with another name.`, 'would-overwrite');
    }
  }
  await writeFileAtomic(filePath, serializeWorkspace(content, now), { keepBackup: true, fs });
}
