// Which history files the page may have the engine read: only those the user picked in the
// native dialog this session. The page names a file by path, so without this a compromised
// page could have the engine read any file on disk.
import { stat } from 'node:fs/promises';
import path from 'node:path';
import type { HistoryHandlers } from '../../shared/api/history-handlers';
import type { HistoryFileRef } from '../../shared/history/history-requests';

export class HistoryFileGate {
  private readonly granted = new Set<string>();

  /** Records a path the dialog returned and describes it for the page. */
  async grant(filePath: string): Promise<{ status: 'chosen'; path: string; name: string; bytes: number }> {
    const resolved = path.resolve(filePath);
    this.granted.add(resolved);
    let bytes = 0;
    try {
      bytes = (await stat(resolved)).size;
    } catch {
      // The reader reports a missing or unreadable file with its own message.
    }
    return { status: 'chosen', path: resolved, name: path.basename(resolved), bytes };
  }

  /** Throws unless the reference is a path granted by the dialog. */
  check(ref: HistoryFileRef): void {
    if (ref.kind !== 'path') throw new Error('the desktop app reads delay history by path: choose the file with the file dialog');
    if (!this.granted.has(path.resolve(ref.path))) throw new Error(`${ref.path} was not chosen in the file dialog; choose it there first`);
  }

  /** The history handlers with every file reference checked first. */
  guard(handlers: HistoryHandlers): HistoryHandlers {
    return {
      ...handlers,
      previewHistory: async (ref) => {
        this.check(ref);
        return handlers.previewHistory(ref);
      },
      startHistoryFit: async (args) => {
        this.check(args.source);
        return handlers.startHistoryFit(args);
      },
    };
  }
}
