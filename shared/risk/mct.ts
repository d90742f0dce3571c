// Minimum connection times: the connection type from the airports' countries, the default MCT
// per type, user overrides per airport and type, and the ground-transfer allowance on an airport change.
//
// IATA Resolution 765 defines the minimum connecting time; the values themselves are set per
// airport (and airline) and are not public data, hence defaults plus a user's override file.
import type { ConnectionType, MctRule, MctSource } from './types';

/**
 * Default MCT by connection type, in minutes. Common practice, no source: round values of the
 * order airports publish, to be overridden with real values per airport.
 */
export const DEFAULT_MCT_MINUTES: Readonly<Record<ConnectionType, number>> = {
  domestic: 45,
  international: 60,
  'international-arrival': 90,
  // Domestic onto international: treated like an international connection (common practice, no source).
  'international-departure': 60,
};

/** Default ground-transfer allowance added on an airport change (common practice, no source). */
export const DEFAULT_TRANSFER_MINUTES = 90;

/**
 * Countries where every arriving international passenger clears entry formalities, even when
 * connecting onwards abroad (no airside transit). From memory, no source: the United States.
 */
export const NO_AIRSIDE_TRANSIT_COUNTRIES: ReadonlySet<string> = new Set(['US']);

export const CONNECTION_TYPES: readonly ConnectionType[] = ['domestic', 'international', 'international-arrival', 'international-departure'];

/**
 * The connection type from the countries of the inbound origin, the connecting airport (where the
 * inbound leg lands), the outbound leg's departure airport (the same, unless an airport change)
 * and the outbound destination. An inbound leg from another country is an arrival from abroad;
 * it is an airside transit only when the outbound leg also leaves the country and the country
 * allows transit without entry.
 * @example connectionType('GB', 'US', 'US', 'US') // 'international-arrival'
 */
export function connectionType(inboundOrigin: string, arrivalCountry: string, departureCountry: string, outboundDestination: string): ConnectionType {
  const inboundInternational = inboundOrigin !== arrivalCountry;
  const outboundInternational = departureCountry !== outboundDestination || arrivalCountry !== departureCountry;
  if (inboundInternational) {
    return outboundInternational && !NO_AIRSIDE_TRANSIT_COUNTRIES.has(arrivalCountry) ? 'international' : 'international-arrival';
  }
  return outboundInternational ? 'international-departure' : 'domestic';
}

export interface ResolvedMct {
  /** MCT for the connection type, plus the transfer allowance on an airport change. */
  readonly mctMinutes: number;
  readonly transferMinutes: number;
  readonly source: MctSource;
}

/**
 * The MCT of one connection. Rules are searched last to first (a later rule wins); an airport's own
 * rule beats a '*' rule. On an airport change, the 'transfer' rule for the exact airport pair beats
 * one for the arrival airport alone, which beats '*'.
 */
export function resolveMct(
  rules: readonly MctRule[],
  airport: string,
  departAirport: string,
  type: ConnectionType,
  defaultTransferMinutes: number = DEFAULT_TRANSFER_MINUTES,
): ResolvedMct {
  const base = findRule(rules, (r) => r.type === type && r.airport === airport) ?? findRule(rules, (r) => r.type === type && r.airport === '*');
  let mct = base ? base.minutes : DEFAULT_MCT_MINUTES[type];
  let overridden = Boolean(base);
  let transfer = 0;
  if (departAirport !== airport) {
    const rule =
      findRule(rules, (r) => r.type === 'transfer' && r.airport === airport && r.departAirport === departAirport) ??
      findRule(rules, (r) => r.type === 'transfer' && r.airport === airport && r.departAirport === undefined) ??
      findRule(rules, (r) => r.type === 'transfer' && r.airport === '*');
    transfer = rule ? rule.minutes : defaultTransferMinutes;
    overridden ||= Boolean(rule);
    mct += transfer;
  }
  return { mctMinutes: mct, transferMinutes: transfer, source: overridden ? 'override' : 'default' };
}

function findRule(rules: readonly MctRule[], match: (rule: MctRule) => boolean): MctRule | undefined {
  for (let i = rules.length - 1; i >= 0; i--) {
    const rule = rules[i];
    if (rule && match(rule)) return rule;
  }
  return undefined;
}
