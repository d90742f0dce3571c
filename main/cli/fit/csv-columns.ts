// Reads the columns a `layline fit` model needs from delimited text, with errors that name
// the file's line and column so a user can fix the data.
//
// Fields are split with the delay-history reader's RFC 4180 splitter; a quoted line break
// inside a field is not supported here (fit inputs are short codes and numbers).
import { detectDelimiter, splitCsvLine } from '../../../shared/history/csv-history-parser';
import { CliFailure } from '../io';

export interface CsvTable {
  readonly header: readonly string[];
  /** Data rows (blank lines excluded). */
  readonly rowCount: number;
  /** Calls `fn` for each data row with its cells and its 1-based line number in the file. */
  forEachRow(fn: (cells: readonly string[], line: number) => void): void;
}

/**
 * Splits text into a header and data rows; blank lines are skipped. Rows are split into
 * cells only as they are visited, so a million-row file is never held as a million arrays.
 * Throws CliFailure when there is no header.
 */
export function readCsvTable(text: string, source: string): CsvTable {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  const headerAt = lines.findIndex((l) => l.trim() !== '');
  if (headerAt === -1) throw new CliFailure(`${source} is empty: expected a header row and data rows`);
  const delimiter = detectDelimiter(lines[headerAt]!);
  const header = splitCsvLine(lines[headerAt]!, delimiter).map((h) => h.trim());
  let rowCount = 0;
  for (let i = headerAt + 1; i < lines.length; i++) if (lines[i]!.trim() !== '') rowCount++;
  return {
    header,
    rowCount,
    forEachRow(fn) {
      for (let i = headerAt + 1; i < lines.length; i++) {
        const l = lines[i]!;
        if (l.trim() !== '') fn(splitCsvLine(l, delimiter), i + 1);
      }
    },
  };
}

/**
 * The index of the column named `wanted` (exact name first, then ignoring case), or of the
 * first default candidate present when `wanted` is undefined. Throws CliFailure listing the
 * header when none is found.
 */
export function findColumn(table: CsvTable, wanted: string | undefined, defaults: readonly string[], flag: string, source: string): number {
  const candidates = wanted === undefined ? defaults : [wanted];
  for (const name of candidates) {
    const exact = table.header.indexOf(name);
    if (exact !== -1) return exact;
    const loose = table.header.findIndex((h) => h.toLowerCase() === name.toLowerCase());
    if (loose !== -1) return loose;
  }
  const looked = candidates.map((c) => `'${c}'`).join(' or ');
  throw new CliFailure(`${source} has no column ${looked} (columns: ${table.header.map((h) => `'${h}'`).join(', ') || 'none'}); name it with ${flag}`);
}

/** Where a cell sits, for error messages. */
export interface CellPlace {
  readonly source: string;
  readonly line: number;
  readonly columnName: string;
}

/** A cell as text, trimmed; a missing or empty cell is a CliFailure naming the line and column. */
export function textCell(cells: readonly string[], column: number, place: CellPlace): string {
  const cell = cells[column]?.trim() ?? '';
  if (cell === '') throw new CliFailure(`${place.source} line ${place.line}: column '${place.columnName}' is empty`);
  return cell;
}

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/** A cell as a finite number (decimal point, optional exponent); anything else is a CliFailure. */
export function numberCell(cells: readonly string[], column: number, place: CellPlace): number {
  const cell = textCell(cells, column, place);
  const value = NUMBER.test(cell) ? Number(cell) : NaN;
  if (!Number.isFinite(value)) throw new CliFailure(`${place.source} line ${place.line}: column '${place.columnName}' holds '${cell}', which is not a number`);
  return value;
}
