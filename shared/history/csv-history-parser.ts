// Pure, streaming parsing of delimited delay-history text into a HistoryTable: header and
// delimiter detection, RFC 4180 quoting (quoted delimiters, doubled quotes, quoted line breaks),
// and only the mapped columns copied out. Text arrives in chunks of any size (push), so the
// Node reader and a browser File stream share this code and neither holds the whole file.
import { HISTORY_FIELDS, resolveHistoryMapping, type ColumnOverrides, type HistoryMapping } from './columns';
import { HistoryFileError } from './history-file-error';
import { createHistoryTableBuilder, type HistoryTable, type HistoryTableBuilder } from './history-table';

const QUOTE = 34;
const DEFAULT_MAX_LINE = 1 << 20;

/** Recognises archives and binary content from a file's first bytes; returns an error message or null. */
export function sniffBinary(head: Uint8Array): string | null {
  if (head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04) {
    return 'this is a ZIP archive (the BTS download comes zipped): unzip it and import the CSV inside';
  }
  if (head[0] === 0x1f && head[1] === 0x8b) return 'this is a gzip-compressed file: decompress it and import the CSV';
  if (head.indexOf(0) !== -1) return 'this file holds binary data (NUL bytes), not delimited text';
  let control = 0;
  for (const b of head) if (b < 9 || (b > 13 && b < 32) || b === 127) control++;
  if (head.length > 0 && control / head.length > 0.01) return 'this file holds binary data (control characters), not delimited text';
  return null;
}

/** The delimiter of a header line: whichever of , ; tab | occurs most outside quotes. */
export function detectDelimiter(headerLine: string): string {
  const counts = new Map<string, number>([
    [',', 0],
    [';', 0],
    ['\t', 0],
    ['|', 0],
  ]);
  let quoted = false;
  for (const ch of headerLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && counts.has(ch)) counts.set(ch, (counts.get(ch) ?? 0) + 1);
  }
  let best = ',';
  for (const [d, c] of counts) if (c > (counts.get(best) ?? 0)) best = d;
  return best;
}

/** Splits one whole line into all its fields (used for the header and for previews). */
export function splitCsvLine(line: string, delimiter: string): string[] {
  const fields: string[] = [];
  let p = 0;
  const end = line.length;
  for (;;) {
    if (line.charCodeAt(p) === QUOTE) {
      const [value, next] = readQuoted(line, p, end);
      fields.push(value);
      const d = line.indexOf(delimiter, next);
      if (d === -1 || d >= end) return fields;
      p = d + 1;
    } else {
      const d = line.indexOf(delimiter, p);
      if (d === -1 || d >= end) {
        fields.push(line.slice(p, end));
        return fields;
      }
      fields.push(line.slice(p, d));
      p = d + 1;
    }
  }
}

// A quoted field starting at p: its unescaped value and the index just past the closing quote.
function readQuoted(text: string, p: number, end: number): [string, number] {
  let q = p + 1;
  let value = '';
  for (;;) {
    const close = text.indexOf('"', q);
    if (close === -1 || close >= end) return [value + text.slice(q, end), end];
    if (text.charCodeAt(close + 1) === QUOTE && close + 1 < end) {
      value += text.slice(q, close + 1);
      q = close + 2;
    } else {
      return [value + text.slice(q, close), close + 1];
    }
  }
}

/**
 * Splits records field by field in one forward pass over the text, so quoted fields (with
 * delimiters, doubled quotes or line breaks inside) and line ends are found together. Only the
 * mapped columns are copied out; past the last of them the rest of the line is skipped.
 */
class CsvRecordParser {
  private readonly slotOfColumn: Int32Array;
  private readonly lastColumn: number;
  private readonly cells: (string | undefined)[] = new Array<string | undefined>(HISTORY_FIELDS.length).fill(undefined);
  /** Records seen, the header included, for row numbers in samples. */
  private record = 1;

  constructor(
    private readonly delimiter: string,
    mapping: HistoryMapping,
    private readonly builder: HistoryTableBuilder,
    private readonly maxLine: number,
    private readonly path: string,
  ) {
    this.lastColumn = Math.max(...Object.values(mapping));
    this.slotOfColumn = new Int32Array(this.lastColumn + 1).fill(-1);
    HISTORY_FIELDS.forEach((f, slot) => {
      const column = mapping[f];
      if (column !== undefined) this.slotOfColumn[column] = slot;
    });
  }

  /** Parses the complete records of text from `start`; returns where the unfinished one begins. */
  parse(text: string, start: number, final: boolean): number {
    const length = text.length;
    const delimiter = this.delimiter;
    const slotOfColumn = this.slotOfColumn;
    const lastColumn = this.lastColumn;
    const cells = this.cells;
    const delimiterCode = delimiter.charCodeAt(0);
    let p = start;
    let nl = text.indexOf('\n', p);
    let nextQuote = text.indexOf('"', p);
    while (p < length) {
      const recordStart = p;
      if (nl !== -1 && nl < p) nl = text.indexOf('\n', p);
      if (nl === -1 && !final) return this.unfinished(text, recordStart);
      const lineEnd = nl === -1 ? length : nl;
      // A blank line (or a lone CR) is no record.
      if (lineEnd === p || (lineEnd === p + 1 && text.charCodeAt(p) === 13)) {
        p = lineEnd + 1;
        continue;
      }
      let col = 0;
      for (;;) {
        if (nextQuote !== -1 && nextQuote < p) nextQuote = text.indexOf('"', p);
        // Past the last mapped column, jump to the line end unless a quote could hide a line break.
        if (col > lastColumn && (nextQuote === -1 || nextQuote > nl)) break;
        const slot = col <= lastColumn ? slotOfColumn[col]! : -1;
        let ended = false;
        if (text.charCodeAt(p) === QUOTE) {
          let q = text.indexOf('"', p + 1);
          while (q !== -1 && text.charCodeAt(q + 1) === QUOTE) q = text.indexOf('"', q + 2);
          if (q === -1) {
            if (!final) return this.unfinished(text, recordStart);
            q = length;
          }
          if (slot >= 0) {
            const raw = text.slice(p + 1, q);
            cells[slot] = raw.indexOf('""') === -1 ? raw : raw.replaceAll('""', '"');
          }
          p = q + 1;
          if (nl !== -1 && nl < p) nl = text.indexOf('\n', p);
          if (nl === -1 && !final) return this.unfinished(text, recordStart);
          // Anything between the closing quote and the next delimiter is dropped (lenient).
          const d = text.indexOf(delimiter, p);
          const end = nl === -1 ? length : nl;
          if (d !== -1 && d < end) p = d + 1;
          else ended = true;
        } else {
          // Fields are short, so a character loop beats one indexOf call per field.
          const end = nl === -1 ? length : nl;
          let d = p;
          while (d < end && text.charCodeAt(d) !== delimiterCode) d++;
          if (d < end) {
            if (slot >= 0) cells[slot] = text.slice(p, d);
            p = d + 1;
          } else {
            if (slot >= 0) cells[slot] = text.slice(p, end > p && text.charCodeAt(end - 1) === 13 ? end - 1 : end);
            ended = true;
          }
        }
        col++;
        if (ended) break;
      }
      const next = nl === -1 ? length : nl;
      if (next - recordStart > this.maxLine) throw this.tooLong();
      this.record++;
      if (col <= lastColumn) this.builder.addShortRow(this.record, text.slice(recordStart, Math.min(next, recordStart + 200)).replace(/\r$/, ''));
      // Every mapped slot was just written, so no stale cell survives into the next row.
      else this.builder.add(cells, this.record);
      p = next + 1;
    }
    return Math.min(p, length);
  }

  private unfinished(text: string, recordStart: number): number {
    if (text.length - recordStart > this.maxLine) throw this.tooLong();
    return recordStart;
  }

  private tooLong(): HistoryFileError {
    return new HistoryFileError(`${this.path}: row ${this.record + 1} is longer than ${this.maxLine} characters; this does not look like a delay history file (one flight per line)`);
  }
}

export interface CsvHistoryParserOptions {
  readonly overrides?: ColumnOverrides;
  /** The longest line accepted, in UTF-16 code units; default 1 MiB. */
  readonly maxLineLength?: number;
  /** The file's name, for messages. */
  readonly source: string;
}

export interface CsvHistoryParser {
  /** Parses the next piece of text; throws HistoryFileError for wrong columns or an over-long line. */
  push(text: string): void;
  /** Parses what is left and returns the table; throws HistoryFileError for a file without rows. */
  finish(): { readonly header: readonly string[]; readonly mapping: HistoryMapping; readonly table: HistoryTable };
  /** Data rows parsed so far. */
  readonly rows: number;
}

/** A streaming parser; see CsvHistoryParser. */
export function createCsvHistoryParser(options: CsvHistoryParserOptions): CsvHistoryParser {
  const maxLine = options.maxLineLength ?? DEFAULT_MAX_LINE;
  const path = options.source;
  const builder = createHistoryTableBuilder();
  let header: string[] | null = null;
  let mapping: HistoryMapping = {};
  let records: CsvRecordParser | null = null;
  let carry = '';

  // Takes the header from the first non-empty line; returns where the data starts, or -1.
  const takeHeader = (text: string): number => {
    let start = 0;
    for (;;) {
      const nl = text.indexOf('\n', start);
      if (nl === -1) {
        if (text.length - start > maxLine) throw new HistoryFileError(`${path}: row 1 is longer than ${maxLine} characters; this does not look like a delay history file (one flight per line)`);
        return -1;
      }
      let line = text.slice(start, nl).replace(/\r$/, '');
      if (line.charCodeAt(0) === 0xfeff) line = line.slice(1);
      if (line.trim() === '') {
        start = nl + 1;
        continue;
      }
      const delimiter = detectDelimiter(line);
      header = splitCsvLine(line, delimiter).map((h) => h.trim());
      try {
        mapping = resolveHistoryMapping(header, options.overrides);
      } catch (err) {
        throw new HistoryFileError((err as Error).message);
      }
      records = new CsvRecordParser(delimiter, mapping, builder, maxLine, path);
      return nl + 1;
    }
  };

  const consume = (text: string, final: boolean): string => {
    let from = 0;
    if (records === null) {
      from = takeHeader(final ? text + '\n' : text);
      if (from === -1) return text;
    }
    return text.slice(records!.parse(text, from, final));
  };

  return {
    push(text) {
      carry = consume(carry + text, false);
    },
    finish() {
      if (carry.length > 0 || records === null) consume(carry, true);
      carry = '';
      if (header === null) throw new HistoryFileError(`${path} has no header line`);
      if (builder.rows === 0) throw new HistoryFileError(`${path} has a header but no data rows`);
      return { header, mapping, table: builder.finish() };
    },
    get rows() {
      return builder.rows;
    },
  };
}
