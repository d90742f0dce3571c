// The streams a CLI command talks to, injectable so commands are testable in-process.
export interface CliIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Reads a whole file, or standard input for '-'. */
  readonly readInput: (pathOrDash: string) => Promise<string>;
  /** True when stderr is a terminal, so progress bars may be drawn. */
  readonly stderrIsTty: boolean;
  readonly cwd: string;
}

/** A usage error: wrong flags or arguments. The CLI prints it and exits with code 2. */
export class UsageError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'UsageError';
  }
}

/** A failure the user can act on (bad file, bad data). Printed without a stack; exit code 1. */
export class CliFailure extends Error {
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
    this.name = 'CliFailure';
  }
}
