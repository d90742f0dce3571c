// What a CLI subcommand is: a name, its usage text, and a run function.
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { UsageError, type CliIo } from './io';

export interface CliCommand {
  readonly name: string;
  /** One line for the overview in `layline --help`. */
  readonly summary: string;
  /** The full usage text for `layline <name> --help`. */
  readonly usage: string;
  /** Resolves with the process exit code. */
  readonly run: (argv: string[], io: CliIo) => Promise<number>;
}

type Options = NonNullable<ParseArgsConfig['options']>;

/**
 * Parses flags strictly: an unknown flag or a missing value is a UsageError (exit 2).
 */
export function parseFlags<O extends Options>(argv: string[], options: O, commandName: string) {
  try {
    return parseArgs({ args: argv, options, strict: true, allowPositionals: true });
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    throw new UsageError(`${commandName}: ${message.replace(/\. To specify a positional argument.*$/s, '')}`);
  }
}
