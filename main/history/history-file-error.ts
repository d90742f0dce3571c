// Node-side helpers around HistoryFileError (defined in shared/history so the pure parser can
// throw it): the abort check the file readers make between chunks.
export { HistoryFileError } from '../../shared/history/history-file-error';

/** Throws the signal's reason (an AbortError by default) once it has been aborted. */
export function throwIfAborted(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw signal.reason instanceof Error ? signal.reason : new DOMException('The operation was aborted', 'AbortError');
}
