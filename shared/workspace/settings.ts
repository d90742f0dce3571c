// The user's analysis settings: what a workspace saves and what scoring reads.
//
// One schema serves the workspace file, the API contract and the settings screen, so
// a value the screen accepts is a value the file and the engine accept.
import * as v from 'valibot';
import type { ConnectionType } from '../risk/types';

/** Connection types for MCT overrides, as shared/risk/types.ts names them. */
export const MCT_CONNECTION_TYPES = ['domestic', 'international', 'international-arrival', 'international-departure'] as const satisfies readonly ConnectionType[];
export type MctConnectionType = (typeof MCT_CONNECTION_TYPES)[number];

export const THEMES = ['system', 'light', 'dark'] as const;
export type ThemeChoice = (typeof THEMES)[number];

export const IataCodeSchema = v.pipe(v.string(), v.regex(/^[A-Z]{3}$/, 'an IATA airport code is three capital letters'));

export const MctOverrideSchema = v.strictObject({
  airport: IataCodeSchema,
  connectionType: v.picklist(MCT_CONNECTION_TYPES),
  minutes: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(600)),
});
export type MctOverride = v.InferOutput<typeof MctOverrideSchema>;

export const TARGET_MIN = 0.5;
export const TARGET_MAX = 0.999;

export const AnalysisSettingsSchema = v.strictObject({
  /** The on-time probability policy each connection is held to. */
  targetProbability: v.pipe(v.number(), v.minValue(TARGET_MIN), v.maxValue(TARGET_MAX)),
  /** Minutes until the next departure after a missed connection. */
  rebookGapMinutes: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(2880)),
  /** Extra minutes added to the MCT when the traveler must change airports. */
  transferAllowanceMinutes: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(600)),
  mctOverrides: v.pipe(v.array(MctOverrideSchema), v.maxLength(500)),
  /** Seed of the Monte Carlo draws, so the same workspace always shows the same figures. */
  seed: v.pipe(v.number(), v.integer(), v.minValue(0), v.maxValue(2 ** 31 - 1)),
});
export type AnalysisSettings = v.InferOutput<typeof AnalysisSettingsSchema>;

export const DEFAULT_ANALYSIS_SETTINGS: AnalysisSettings = Object.freeze({
  targetProbability: 0.9,
  rebookGapMinutes: 180,
  transferAllowanceMinutes: 90,
  mctOverrides: [],
  seed: 1,
});

/** Replaces any earlier override for the same airport and type; later rows win. */
export function normaliseMctOverrides(rows: readonly MctOverride[]): MctOverride[] {
  const byKey = new Map<string, MctOverride>();
  for (const row of rows) byKey.set(`${row.airport}/${row.connectionType}`, row);
  return [...byKey.values()].sort((a, b) => a.airport.localeCompare(b.airport) || a.connectionType.localeCompare(b.connectionType));
}
