// Types for compact-airports.mjs, so tests can call it.
export interface AirportSource {
  readonly version: string;
  readonly geo: Record<string, { latitude?: number; longitude?: number; name?: string; city?: string; country?: string }>;
  readonly zones: Record<string, string>;
}
export interface CompactAirportTable {
  readonly source: string;
  readonly columns: string;
  readonly skipped: number;
  readonly zones: string[];
  readonly rows: string;
}
export const AIRPORT_TABLE_PATH: string;
export function readAirportSource(): AirportSource;
export function compactAirports(source: AirportSource): CompactAirportTable;
export function serialiseTable(table: CompactAirportTable): string;
