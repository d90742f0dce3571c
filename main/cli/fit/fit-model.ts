// What `layline fit --model NAME` needs from a model: how to build it from a table, which
// extra flags it takes, and how to summarise a fit in its own terms. Each model lives in its
// own module and is listed in fit-models.ts, so adding one (e.g. `route`) touches no other.
import type { FitResult } from '../../../shared/inference/fit-types';
import type { NonCentredBlock } from '../../../shared/inference/centred-view';
import type { Model } from '../../../shared/inference/model';
import type { Rng } from '../../../shared/inference/rng';
import type { CliIo } from '../io';
import type { CsvTable } from './csv-columns';

export type FlagValues = Readonly<Record<string, string | boolean | undefined>>;

export interface FitSummary {
  /** Keys merged into the JSON output after the common ones (grouped: `groups`). */
  readonly json: Readonly<Record<string, unknown>>;
  /** The human-readable table, ending in a newline. */
  readonly text: string;
  /** Facts about the summary for the diagnostics (e.g. which draws it averaged). */
  readonly diagnostics?: Readonly<Record<string, string | number | boolean>>;
}

export interface PreparedFit {
  readonly model: Model;
  /** Data rows behind the fit. */
  readonly observations: number;
  /** Facts about the model to print with the diagnostics (e.g. the likelihood used). */
  readonly modelDiagnostics?: Readonly<Record<string, string | number | boolean>>;
  /** Non-centred blocks NUTS should sample in centred form (data-rich groups; see centred-view.ts). */
  readonly nutsCentredBlocks?: readonly NonCentredBlock[];
  summarise(result: FitResult, rng: Rng): FitSummary;
}

/**
 * The input file as a model may read it: as a delimited table (the grouped model), or by its
 * path with a reader of its own (e.g. a delay-history reader that streams CSV or Parquet).
 */
export interface FitInput {
  /** The path as given on the command line ('-' for standard input). */
  readonly path: string;
  /** The path or 'standard input', for messages. */
  readonly source: string;
  readonly io: CliIo;
  /** Reads the whole input as a delimited table with a header row. */
  readTable(): Promise<CsvTable>;
}

export interface FitModelAdapter {
  /** The value of --model. */
  readonly name: string;
  /** One line for the usage text. */
  readonly summary: string;
  /** Usage lines for the flags this model adds. */
  readonly flagUsage: readonly string[];
  /** parseArgs options for those flags (all strings). */
  readonly flags: Readonly<Record<string, { readonly type: 'string' }>>;
  /** Reads the input and builds the model; throws CliFailure for unusable data. */
  prepare(input: FitInput, flags: FlagValues): Promise<PreparedFit>;
}

/** Mean and sd of one constrained quantity over posterior draws. */
export interface Moments {
  readonly mean: number;
  readonly sd: number;
}
