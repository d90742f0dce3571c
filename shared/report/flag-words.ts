// Connection flags as readable words, for reports, the app's tables and the CSV reader.
//
// The codes come from the parser and the risk engine (shared/risk/types.ts RiskFlag).
import type { RiskFlag } from '../risk/types';

const FLAG_WORDS: Readonly<Record<RiskFlag, string>> = {
  'below-mct': 'shorter than the minimum connection time',
  'airport-change': 'change of airport',
  'separate-tickets': 'separate tickets',
  overnight: 'overnight connection',
  'negative-layover': 'departs before the inbound flight lands',
  'dst-change-during-trip': 'clocks change during the trip',
  stopover: 'stopover (over 24 hours, not scored)',
  'below-target': 'below target',
  'target-unreachable': 'target out of reach',
  'pooled-route': 'estimate pooled from similar routes',
};

/** The words for one flag; an unknown code is shown as itself rather than dropped. */
export function flagWords(flag: string): string {
  return Object.prototype.hasOwnProperty.call(FLAG_WORDS, flag) ? FLAG_WORDS[flag as RiskFlag] : flag;
}

/** All of a connection's flags as one comma-separated phrase; '' when there are none. */
export function flagsPhrase(flags: readonly string[]): string {
  return flags.map(flagWords).join(', ');
}
