// Parses a user's MCT override file, CSV (or TSV) with a header row, or JSON, into MctRules.
//
// CSV columns (case-insensitive): airport, type, minutes, and optionally departAirport (for
// 'transfer' rules). JSON: an array of { airport, type, minutes, departAirport? } objects, or
// { "rules": [...] }. Every bad row becomes a Problem naming its line; good rows are kept.
import type { Problem } from '../itinerary/types';
import type { ConnectionType, MctRule } from './types';

export interface ParsedMctRules {
  readonly rules: readonly MctRule[];
  readonly problems: readonly Problem[];
}

const TYPE_ALIASES: Readonly<Record<string, ConnectionType | 'transfer'>> = {
  domestic: 'domestic',
  'domestic-domestic': 'domestic',
  'dom-dom': 'domestic',
  international: 'international',
  'international-international': 'international',
  'intl-intl': 'international',
  transit: 'international',
  'international-arrival': 'international-arrival',
  'arriving-from-abroad': 'international-arrival',
  'international-domestic': 'international-arrival',
  'intl-dom': 'international-arrival',
  'international-departure': 'international-departure',
  'domestic-international': 'international-departure',
  'dom-intl': 'international-departure',
  transfer: 'transfer',
  'ground-transfer': 'transfer',
  'airport-change': 'transfer',
};

const COLUMN_ALIASES: Readonly<Record<string, keyof RawRule>> = {
  airport: 'airport',
  station: 'airport',
  'connecting-airport': 'airport',
  type: 'type',
  'connection-type': 'type',
  connection: 'type',
  minutes: 'minutes',
  mct: 'minutes',
  'mct-minutes': 'minutes',
  'departairport': 'departAirport',
  'depart-airport': 'departAirport',
  'departure-airport': 'departAirport',
  'to-airport': 'departAirport',
};

/** Longest MCT or transfer allowance accepted, in minutes (a day). */
const MAX_RULE_MINUTES = 1440;

interface RawRule {
  airport?: unknown;
  type?: unknown;
  minutes?: unknown;
  departAirport?: unknown;
}

/**
 * Reads MCT rules from CSV/TSV or JSON text. Never throws; an empty or unreadable file gives no
 * rules and an error problem.
 * @example parseMctRules('airport,type,minutes\nJFK,international-arrival,120').rules[0].minutes // returns 120
 */
export function parseMctRules(text: string): ParsedMctRules {
  const body = text.replace(/^\uFEFF/, '');
  const trimmed = body.trim();
  if (!trimmed) return { rules: [], problems: [problem(0, 'mct-empty', 'the MCT file is empty')] };
  if (trimmed.startsWith('[') || trimmed.startsWith('{')) return parseJson(trimmed);
  return parseDelimited(body);
}

function parseJson(text: string): ParsedMctRules {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch (err) {
    return { rules: [], problems: [problem(0, 'mct-bad-json', `the MCT file is not valid JSON: ${err instanceof Error ? err.message : String(err)}`)] };
  }
  const list = Array.isArray(data) ? data : isRecord(data) && Array.isArray(data['rules']) ? (data['rules'] as unknown[]) : null;
  if (!list) return { rules: [], problems: [problem(0, 'mct-bad-json', 'the MCT JSON must be an array of rules or an object with a "rules" array')] };
  const rules: MctRule[] = [];
  const problems: Problem[] = [];
  list.forEach((item, index) => {
    const line = index + 1;
    if (!isRecord(item)) {
      problems.push(problem(line, 'mct-bad-rule', `rule ${line}: expected an object with airport, type and minutes`));
      return;
    }
    const raw: RawRule = {};
    for (const [key, value] of Object.entries(item)) {
      const field = COLUMN_ALIASES[normaliseName(key)];
      if (field) raw[field] = value;
      else problems.push(problem(line, 'mct-unknown-field', `rule ${line}: unknown field "${key}" ignored`, 'warning'));
    }
    pushRule(raw, line, `rule ${line}`, rules, problems);
  });
  return { rules, problems };
}

function parseDelimited(text: string): ParsedMctRules {
  const lines = text.split(/\r\n|\n|\r/);
  const headerIndex = lines.findIndex((l) => l.trim() !== '' && !l.trim().startsWith('#'));
  const headerLine = lines[headerIndex] ?? '';
  const delimiter = headerLine.includes('\t') ? '\t' : headerLine.includes(';') && !headerLine.includes(',') ? ';' : ',';
  const header = splitRow(headerLine, delimiter).map((h) => COLUMN_ALIASES[normaliseName(h)]);
  const problems: Problem[] = [];
  const missing = (['airport', 'type', 'minutes'] as const).filter((c) => !header.includes(c));
  if (missing.length) {
    return {
      rules: [],
      problems: [problem(headerIndex + 1, 'mct-bad-header', `the MCT file needs a header row with airport, type and minutes columns; missing: ${missing.join(', ')}`)],
    };
  }
  const rules: MctRule[] = [];
  for (let i = headerIndex + 1; i < lines.length; i++) {
    const rowText = lines[i] ?? '';
    if (rowText.trim() === '' || rowText.trim().startsWith('#')) continue;
    const cells = splitRow(rowText, delimiter);
    const raw: RawRule = {};
    header.forEach((field, c) => {
      if (field && cells[c] !== undefined && cells[c] !== '') raw[field] = cells[c];
    });
    if (cells.length > header.length) problems.push(problem(i + 1, 'mct-extra-cells', `line ${i + 1}: more cells than header columns; the extra ones are ignored`, 'warning'));
    pushRule(raw, i + 1, `line ${i + 1}`, rules, problems);
  }
  if (rules.length === 0 && problems.length === 0) problems.push(problem(0, 'mct-empty', 'the MCT file has a header but no rules'));
  return { rules, problems };
}

function pushRule(raw: RawRule, line: number, where: string, rules: MctRule[], problems: Problem[]): void {
  const airport = typeof raw.airport === 'string' ? raw.airport.trim().toUpperCase() : '';
  if (!/^[A-Z]{3}$/.test(airport) && airport !== '*') {
    problems.push(problem(line, 'mct-bad-airport', `${where}: airport must be a three-letter IATA code or '*', got ${JSON.stringify(raw.airport ?? '')}`));
    return;
  }
  const typeName = typeof raw.type === 'string' ? normaliseName(raw.type) : '';
  const type = TYPE_ALIASES[typeName];
  if (!type) {
    problems.push(
      problem(line, 'mct-bad-type', `${where}: type must be one of domestic, international, international-arrival, international-departure, transfer; got ${JSON.stringify(raw.type ?? '')}`),
    );
    return;
  }
  const minutes = typeof raw.minutes === 'number' ? raw.minutes : typeof raw.minutes === 'string' && /^\s*\d+\s*$/.test(raw.minutes) ? Number(raw.minutes) : NaN;
  if (!Number.isInteger(minutes) || minutes < 0 || minutes > MAX_RULE_MINUTES) {
    problems.push(problem(line, 'mct-bad-minutes', `${where}: minutes must be a whole number from 0 to ${MAX_RULE_MINUTES}, got ${JSON.stringify(raw.minutes ?? '')}`));
    return;
  }
  let departAirport: string | undefined;
  if (raw.departAirport !== undefined && raw.departAirport !== '') {
    departAirport = typeof raw.departAirport === 'string' ? raw.departAirport.trim().toUpperCase() : '';
    if (!/^[A-Z]{3}$/.test(departAirport)) {
      problems.push(problem(line, 'mct-bad-airport', `${where}: departAirport must be a three-letter IATA code, got ${JSON.stringify(raw.departAirport)}`));
      return;
    }
    if (type !== 'transfer') {
      problems.push(problem(line, 'mct-bad-rule', `${where}: departAirport only applies to 'transfer' rules`));
      return;
    }
  }
  rules.push(departAirport ? { airport, type, minutes, departAirport, line } : { airport, type, minutes, line });
}

function splitRow(row: string, delimiter: string): string[] {
  // Quoted cells may hold the delimiter; a doubled quote is a literal quote (RFC 4180).
  const cells: string[] = [];
  let cell = '';
  let quoted = false;
  for (let i = 0; i < row.length; i++) {
    const ch = row[i];
    if (quoted) {
      if (ch === '"' && row[i + 1] === '"') {
        cell += '"';
        i++;
      } else if (ch === '"') quoted = false;
      else cell += ch;
    } else if (ch === '"') quoted = true;
    else if (ch === delimiter) {
      cells.push(cell.trim());
      cell = '';
    } else cell += ch;
  }
  cells.push(cell.trim());
  return cells;
}

function normaliseName(name: string): string {
  return name
    .trim()
    .replace(/([a-z])([A-Z])/g, '$1-$2')
    .toLowerCase()
    .replace(/[\s_]+/g, '-');
}

function isRecord(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}

function problem(line: number, code: string, message: string, severity: Problem['severity'] = 'error'): Problem {
  return { line, severity, code, message };
}
