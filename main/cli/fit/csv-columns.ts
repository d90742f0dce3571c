// Reads the columns a `layline fit` model needs from delimited text, with errors that name
// the file's line and column so a user can fix the data.
//
// Fields are split with the delay-history reader's RFC 4180 splitter; a quoted line break
// inside a field is not supported here (fit inputs are short codes and numbers).
import { detectDelimiter, splitCsvLine } from '../../history/csv-history-reader';
import { CliFailure } from '../io';

export interface CsvTable {
  readonly header: readonly string[];
  /** Data rows, each with its 1-based line number in the file. */
  readonly rows: readonly { readonly line: number; readonly cells: readonly string[] }[];
}

/** Splits text into a header and data rows; blank lines are skipped. Throws CliFailure when there is no header. */
export function readCsvTable(text: string, source: string): CsvTable {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  let headerAt = lines.findIndex((l) => l.trim() !== '');
  if (headerAt === -1) throw new CliFailure(`${source} is empty: expected a header row and data rows`);
  const delimiter = detectDelimiter(lines[headerAt]!);
  const header = splitCsvLine(lines[headerAt]!, delimiter).map((h) => h.trim());
  const rows: { line: number; cells: string[] }[] = [];
  for (let i = ++headerAt; i < lines.length; i++) {
    const l = lines[i]!;
    if (l.trim() === '') continue;
    rows.push({ line: i + 1, cells: splitCsvLine(l, delimiter) });
  }
  return { header, rows };
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

/** A cell as text, trimmed; a missing or empty cell is a CliFailure naming the line and column. */
export function textCell(table: CsvTable, rowIndex: number, column: number, source: string): string {
  const row = table.rows[rowIndex]!;
  const cell = row.cells[column]?.trim() ?? '';
  if (cell === '') throw new CliFailure(`${source} line ${row.line}: column '${table.header[column]}' is empty`);
  return cell;
}

/** A cell as a finite number (decimal point, optional exponent); anything else is a CliFailure. */
export function numberCell(table: CsvTable, rowIndex: number, column: number, source: string): number {
  const cell = textCell(table, rowIndex, column, source);
  const value = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(cell) ? Number(cell) : NaN;
  if (!Number.isFinite(value)) {
    throw new CliFailure(`${source} line ${table.rows[rowIndex]!.line}: column '${table.header[column]}' holds '${cell}', which is not a number`);
  }
  return value;
}
