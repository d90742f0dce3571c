// The delay-history screen's form, as pure functions: the column mapping the user edits
// (starting from the engine's detection), what it sends as overrides, what still blocks a fit,
// and the durations shown beside the progress bar.
import { HISTORY_FIELDS, REQUIRED_HISTORY_FIELDS, type HistoryField } from '../../shared/history/columns';

/** Per field the chosen column name, or null for "not in this file". */
export type ColumnChoice = Record<HistoryField, string | null>;

export interface PreviewLike {
  readonly detection: { readonly header: readonly string[]; readonly mapping: Partial<Record<HistoryField, number>> };
}

/** The detected mapping as column names. */
export function initialChoice(preview: PreviewLike): ColumnChoice {
  const choice = {} as ColumnChoice;
  for (const field of HISTORY_FIELDS) {
    const index = preview.detection.mapping[field];
    choice[field] = index === undefined ? null : (preview.detection.header[index] ?? null);
  }
  return choice;
}

/** Every field's choice, so the engine uses exactly what the screen shows. */
export function overridesFor(choice: ColumnChoice): Partial<Record<HistoryField, string | null>> {
  return { ...choice };
}

/** The required fields with no column chosen. */
export function missingRequired(choice: ColumnChoice): HistoryField[] {
  return REQUIRED_HISTORY_FIELDS.filter((f) => choice[f] === null);
}

/** Columns chosen for more than one field (each column can hold one field only). */
export function duplicateColumns(choice: ColumnChoice): string[] {
  const seen = new Map<string, number>();
  for (const field of HISTORY_FIELDS) {
    const column = choice[field];
    if (column !== null) seen.set(column, (seen.get(column) ?? 0) + 1);
  }
  return [...seen.entries()].filter(([, n]) => n > 1).map(([c]) => c);
}

/** "45 s", "3 min 05 s", "1 h 02 min"; "—" for null or non-finite. */
export function formatDuration(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms) || ms < 0) return '—';
  const s = Math.round(ms / 1000);
  if (s < 60) return `${s} s`;
  const m = Math.floor(s / 60);
  if (m < 60) return `${m} min ${String(s % 60).padStart(2, '0')} s`;
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`;
}

/** A signed relative error as a percentage, e.g. "-12.8%"; "—" when there is none. */
export function formatRelativeError(error: number | null): string {
  if (error === null || !Number.isFinite(error)) return '—';
  return `${error > 0 ? '+' : ''}${(error * 100).toFixed(1)}%`;
}

/** A probability as a percentage with enough digits for tail figures ("1.42%", "0.070%"). */
export function formatTailPercent(p: number): string {
  const pct = p * 100;
  if (pct >= 10) return `${pct.toFixed(1)}%`;
  if (pct >= 1) return `${pct.toFixed(2)}%`;
  return `${pct.toFixed(3)}%`;
}
