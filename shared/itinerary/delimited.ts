// Reads trips from a table with a header row: CSV (comma or semicolon) or TSV pasted from a
// spreadsheet. Quoted cells follow RFC 4180, including quotes doubled inside and line breaks.
//
// Columns are matched case-insensitively, ignoring spaces and punctuation, with aliases.
import { excerpt, isBlank, MAX_LINE_LENGTH, type InputLine } from './input-lines';
import { LineProblems, tooLongLine, type RawLeg } from './normalise-leg';

export type Column =
  | 'traveler' | 'trip' | 'option' | 'flight' | 'from' | 'to' | 'depart' | 'arrive' | 'booking' | 'deadline'
  | 'departDate' | 'departTime' | 'arriveDate' | 'arriveTime';

const ALIASES: Record<Column, readonly string[]> = {
  traveler: ['traveler', 'traveller', 'passenger', 'passengername', 'travelername', 'travellername', 'pax', 'name', 'person', 'employee'],
  trip: ['trip', 'tripname', 'tripid', 'journey', 'event'],
  option: ['option', 'alternative', 'alt', 'routing', 'itinerary', 'variant', 'choice'],
  flight: ['flight', 'flightno', 'flightnumber', 'flightnum', 'flt', 'fltno'],
  from: ['from', 'origin', 'orig', 'fromairport', 'departureairport', 'departairport', 'deptairport'],
  to: ['to', 'destination', 'dest', 'toairport', 'arrivalairport', 'arriveairport', 'arrairport'],
  depart: ['depart', 'departure', 'departs', 'departlocal', 'departurelocal', 'departuredatetime', 'departdatetime', 'departurelocaltime'],
  arrive: ['arrive', 'arrival', 'arrives', 'arrivelocal', 'arrivallocal', 'arrivaldatetime', 'arrivedatetime', 'arrivallocaltime'],
  booking: ['booking', 'bookingref', 'bookingreference', 'bookingcode', 'pnr', 'recordlocator', 'locator', 'ticket', 'ticketnumber', 'ticketno', 'confirmation', 'confirmationnumber', 'reference', 'ref'],
  deadline: ['deadline', 'mustarriveby', 'arriveby', 'arrivebylocal', 'due'],
  departDate: ['departdate', 'departuredate', 'date'],
  departTime: ['departtime', 'departuretime', 'deptime', 'std'],
  arriveDate: ['arrivedate', 'arrivaldate'],
  arriveTime: ['arrivetime', 'arrivaltime', 'arrtime', 'sta'],
};

const BY_ALIAS = new Map<string, Column>(Object.entries(ALIASES).flatMap(([column, names]) => names.map((n) => [n, column as Column] as const)));

export function headerKey(cell: string): string {
  return cell.toLowerCase().replace(/[^a-z0-9]/g, '');
}

export type Delimiter = '\t' | ',' | ';';

/** Splits one physical line into cells; `open` is true when a quoted cell runs past the line end. */
function splitCells(text: string, delimiter: Delimiter): { cells: string[]; open: boolean } {
  // Most rows have no quotes at all; splitting them needs no character loop.
  if (!text.includes('"')) return { cells: text.split(delimiter), open: false };
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  let i = 0;
  let atCellStart = true;
  while (i < text.length) {
    const ch = text[i];
    if (quoted) {
      if (ch === '"') {
        if (text[i + 1] === '"') {
          cell += '"';
          i += 2;
          continue;
        }
        quoted = false;
      } else cell += ch;
      i++;
      continue;
    }
    if (ch === '"' && atCellStart) {
      quoted = true;
      atCellStart = false;
      i++;
      continue;
    }
    if (ch === delimiter) {
      cells.push(cell);
      cell = '';
      atCellStart = true;
      i++;
      continue;
    }
    if (!(atCellStart && (ch === ' ' || ch === '\u00a0') && delimiter !== '\t')) atCellStart = false;
    cell += ch;
    i++;
  }
  cells.push(cell);
  return { cells, open: quoted };
}

export interface HeaderMatch {
  readonly delimiter: Delimiter;
  readonly columns: Map<Column, number>;
  readonly unknown: string[];
  readonly duplicates: string[];
  /** Cells in the header row. */
  readonly width: number;
}

/** Reads `text` as a header row; null unless at least three known columns include airports or times. */
export function matchHeader(text: string): HeaderMatch | null {
  if (text.length > MAX_LINE_LENGTH) return null;
  let best: HeaderMatch | null = null;
  for (const delimiter of ['\t', ',', ';'] as const) {
    if (!text.includes(delimiter)) continue;
    const { cells } = splitCells(text, delimiter);
    const columns = new Map<Column, number>();
    const unknown: string[] = [];
    const duplicates: string[] = [];
    cells.forEach((cell, index) => {
      const column = BY_ALIAS.get(headerKey(cell));
      if (!column) {
        if (cell.trim() !== '') unknown.push(cell.trim());
      } else if (columns.has(column)) duplicates.push(cell.trim());
      else columns.set(column, index);
    });
    const useful = (columns.has('from') && columns.has('to')) || columns.has('depart') || columns.has('departTime');
    if (columns.size >= 3 && useful && (!best || columns.size > best.columns.size)) best = { delimiter, columns, unknown, duplicates, width: cells.length };
  }
  return best;
}

export interface DelimitedRead {
  readonly legs: { raw: RawLeg; problems: LineProblems }[];
  readonly problems: LineProblems[];
  readonly contextLines: number[];
}

const REQUIRED: readonly [Column, string][] = [
  ['from', 'from'],
  ['to', 'to'],
];

/** Reads every line from the header on. Lines before the header are the caller's business. */
export function readDelimited(lines: readonly InputLine[], headerIndex: number, header: HeaderMatch): DelimitedRead {
  const legs: DelimitedRead['legs'] = [];
  const problems: LineProblems[] = [];
  const headerLine = lines[headerIndex];
  const contextLines: number[] = headerLine ? [headerLine.number] : [];
  const { columns, delimiter } = header;
  const firstHeaderKey = headerKey(splitCells(headerLine?.text ?? '', delimiter).cells[0] ?? '');

  if (headerLine) {
    const p = new LineProblems(headerLine.number, headerLine.text);
    if (header.unknown.length) p.warn('unknown-column', `column${header.unknown.length > 1 ? 's' : ''} ${header.unknown.map((u) => `'${excerpt(u, 30)}'`).join(', ')} not used; known columns: traveler, trip, option, flight, from, depart, to, arrive, booking, deadline`);
    if (header.duplicates.length) p.warn('duplicate-column', `column${header.duplicates.length > 1 ? 's' : ''} ${header.duplicates.map((u) => `'${excerpt(u, 30)}'`).join(', ')} repeat an earlier one and are not used`);
    const missing = REQUIRED.filter(([c]) => !columns.has(c)).map(([, n]) => n);
    if (!columns.has('depart') && !columns.has('departTime')) missing.push('depart');
    if (!columns.has('arrive') && !columns.has('arriveTime')) missing.push('arrive');
    if (missing.length) p.error('missing-column', `the header has no ${missing.join(', ')} column; rows cannot be read without ${missing.length > 1 ? 'them' : 'it'}`);
    if (p.list.length) problems.push(p);
  }
  const headerUsable = (columns.has('depart') || columns.has('departTime')) && (columns.has('arrive') || columns.has('arriveTime')) && columns.has('from') && columns.has('to');

  for (let i = headerIndex + 1; i < lines.length; i++) {
    const first = lines[i];
    if (!first || isBlank(first.text)) continue;
    const tooLong = tooLongLine(first);
    if (tooLong) {
      problems.push(tooLong);
      continue;
    }
    // Join physical lines while a quoted cell is open (RFC 4180 allows line breaks inside quotes).
    let text = first.text;
    let split = splitCells(text, delimiter);
    let last = i;
    while (split.open && last + 1 < lines.length && last - i < 20) {
      last++;
      text += '\n' + (lines[last]?.text ?? '');
      split = splitCells(text, delimiter);
    }
    const p = new LineProblems(first.number, first.text);
    if (split.open) {
      p.error('unterminated-quote', 'a quoted cell is never closed; the line is read without its quotes');
      problems.push(p);
      continue;
    }
    for (let k = i + 1; k <= last; k++) {
      const l = lines[k];
      if (l && !isBlank(l.text)) contextLines.push(l.number);
    }
    i = last;
    const cells = split.cells;
    if (cells.every((c) => c.trim() === '')) {
      contextLines.push(first.number);
      continue;
    }
    if (headerKey(cells[0] ?? '') === firstHeaderKey && matchHeader(text)) {
      // A repeated header, as when two pastes are joined.
      contextLines.push(first.number);
      continue;
    }
    if (!headerUsable) {
      p.error('missing-column', 'row not read: the header lacks a required column (see the header line)');
      problems.push(p);
      continue;
    }
    const cell = (c: Column) => {
      const index = columns.get(c);
      return index === undefined ? '' : (cells[index] ?? '').trim();
    };
    const extra = cells.slice(header.width).filter((c) => c.trim() !== '');
    if (extra.length) p.warn('extra-cells', `the row has ${extra.length} more cell${extra.length > 1 ? 's' : ''} than the header (${extra.map((e) => `'${excerpt(e, 20)}'`).join(', ')}); not used`);
    const joined = (whole: Column, date: Column, time: Column) => cell(whole) || [cell(date), cell(time)].filter(Boolean).join(' ');
    legs.push({
      raw: {
        line: first.number,
        text: first.text,
        traveler: cell('traveler'),
        trip: cell('trip'),
        option: cell('option'),
        flight: cell('flight'),
        booking: cell('booking'),
        from: cell('from'),
        to: cell('to'),
        depart: joined('depart', 'departDate', 'departTime'),
        arrive: joined('arrive', 'arriveDate', 'arriveTime'),
        contextDate: null,
        deadline: cell('deadline'),
      },
      problems: p,
    });
  }
  return { legs, problems, contextLines };
}
