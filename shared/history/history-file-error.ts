// The one error type for delay-history input that cannot be read: wrong columns, binary
// content, an over-long line, an unreadable or empty file. Its message is meant for the user.

export class HistoryFileError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'HistoryFileError';
  }
}
