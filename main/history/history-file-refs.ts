// The desktop engine's readers for the history requests: a file reference must be a path (the
// main process forwards only paths its file dialog returned; see main/electron/history-gate.ts).
import type { HistoryFileRef } from '../../shared/history/history-requests';
import type { HistoryPreview, HistoryReadOptions, HistoryReadResult } from '../../shared/history/read-history-source';
import { previewHistoryFile, readHistoryFile } from './read-history-file';

export function pathOfRef(ref: HistoryFileRef): string {
  if (ref.kind !== 'path') throw new Error('the desktop app reads delay history by path: choose the file with "Choose a file…"');
  return ref.path;
}

export const previewHistoryRef = (ref: HistoryFileRef): Promise<HistoryPreview> => previewHistoryFile(pathOfRef(ref));

export const readHistoryRef = (ref: HistoryFileRef, options: HistoryReadOptions): Promise<HistoryReadResult> => readHistoryFile(pathOfRef(ref), options);
