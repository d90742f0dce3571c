// The one error type for a delay-history file that cannot be read: wrong columns, binary
// content, an over-long line, an unreadable or empty file. Its message is meant for the user.

export class HistoryFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'HistoryFileError';
  }
}

/** Throws the signal's reason (an AbortError by default) once it has been aborted. */
export function throwIfAborted(signal: AbortSignal | undefined): void {
  if (signal?.aborted) throw signal.reason instanceof Error ? signal.reason : new DOMException('The operation was aborted', 'AbortError');
}
