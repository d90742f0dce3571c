// A PosteriorSource backed by a route-posterior bundle: draws per route, generated on demand.
//
// The bundle stores each route's Gaussian approximate posterior, not draws. Draws are made
// here from a seeded generator keyed by the bundle seed and the route, so the same route
// always gets the same draws whatever order routes are asked for, the file stays small
// (about 20 numbers per route instead of hundreds), and routes never asked for cost nothing.
// Draw s of every route shares the same population-level draw s (a future month's effect,
// the degrees of freedom), so routes move together within a draw, as they would in one month.
import { createRng, type Rng } from '../../inference/rng';
import { findAirport, unknownAirportMessage } from '../../time/airports';
import { FAMILY_PARAMETERS, type TailFamily } from '../models/tail-mixture';
import type { DelayDistribution, DelayKind, PoolingLevel, PosteriorSource, PosteriorSourceInfo, RoutePosterior } from '../predictive';
import { BundleFormatError, triangleSize, validateBundle, type PosteriorBundle } from './bundle-schema';
import { TailMixtureDistribution } from './mixture-distribution';

export interface BundleSourceOptions {
  /** Draws per route; defaults to the bundle's own count. Fewer draws are faster, with coarser intervals. */
  readonly drawCount?: number;
  /** Whether an airport code exists at all (unknown codes are errors); defaults to the bundled airport table. */
  readonly isKnownAirport?: (code: string) => boolean;
}

/** A route posterior with the bundle-specific extras: the parameter draws behind each distribution. */
export interface BundleRoutePosterior extends RoutePosterior {
  /** The family's parameters of draw s (a view; do not modify). */
  parameters(s: number): Float64Array;
}

export interface BundlePosteriorSource extends PosteriorSource {
  readonly bundle: PosteriorBundle;
  readonly family: TailFamily;
  /**
   * The posterior for a route in a month the fit saw (label 'YYYY-MM'), using that month's
   * fitted effect instead of a new month's: what held-out days within fitted months need.
   */
  routeInMonth(origin: string, destination: string, kind: DelayKind, monthLabel: string): BundleRoutePosterior;
  route(origin: string, destination: string, kind: DelayKind): BundleRoutePosterior;
}

/** FNV-1a over a string: a stable 32-bit seed per route. */
function hashSeed(seed: number, text: string): number {
  let h = (0x811c9dc5 ^ seed) >>> 0;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h;
}

/** Fitted airports needed before their effects' spread replaces the fit's airport sd (see unseenAirportSd). */
export const MIN_AIRPORTS_FOR_SPREAD = 3;

/**
 * The sd, per parameter, of an airport the fit did not see: the root mean square of the fitted
 * airports' effects, each counted with its posterior variance, sqrt(mean_a(m_a^2 + s_a^2)). That
 * is the EM (M-step) estimate of a normal variance component given the effects' conditional
 * Gaussians (Dempster, Laird & Rubin 1977), capped at the fit's own airport sd.
 *
 * Why not the fit's sd alone: the fit is a MAP in non-centred coordinates (effect = sd * z), where
 * a larger sd with smaller z fits the data equally well and the standard-normal prior on z always
 * prefers it, so the mode's sd runs out to where its own prior stops it. The bundled fit's sd of
 * the typical scale's log is 1.82, while its 229 airports' effects spread by 0.25 (with their
 * own uncertainty, 0.27): drawn with the former, a new airport's typical scale ranged over a
 * factor of 40, and some draws put a tenth of its flights over 15 hours late. Fewer than
 * MIN_AIRPORTS_FOR_SPREAD airports say too little about the spread, and the fit's sd is kept.
 */
export function unseenAirportSd(means: readonly (readonly number[])[], sds: readonly (readonly number[])[], fitted: readonly number[]): number[] {
  if (means.length < MIN_AIRPORTS_FOR_SPREAD) return [...fitted];
  return fitted.map((cap, j) => {
    let sum = 0;
    for (let a = 0; a < means.length; a++) sum += means[a]![j]! ** 2 + sds[a]![j]! ** 2;
    return Math.min(cap, Math.sqrt(sum / means.length));
  });
}

interface GlobalDraws {
  /** Per draw: a new month's effect for each month-effect parameter (drawCount x m). */
  readonly newMonth: Float64Array;
  readonly df: Float64Array;
}

function drawGlobals(b: PosteriorBundle, drawCount: number): GlobalDraws {
  const rng = createRng(hashSeed(b.draws.seed, 'population'));
  const m = b.model.monthEffects.length;
  const newMonth = new Float64Array(drawCount * m);
  const df = new Float64Array(drawCount);
  for (let s = 0; s < drawCount; s++) {
    for (let j = 0; j < m; j++) {
      const g = b.population.monthLogSd[j]!;
      const tau = Math.exp(g.mean + g.sd * rng.normal());
      newMonth[s * m + j] = tau * rng.normal();
    }
    const ldf = b.population.logDf;
    df[s] = ldf ? Math.exp(ldf.mean + ldf.sd * rng.normal()) : NaN;
  }
  return { newMonth, df };
}

/**
 * Builds the source from a validated bundle object.
 * @throws BundleFormatError when the value is not a valid bundle
 */
export function createBundleSource(value: unknown, options: BundleSourceOptions = {}): BundlePosteriorSource {
  const bundle = validateBundle(value);
  const family = bundle.model.family;
  const k = FAMILY_PARAMETERS[family].length;
  const m = bundle.model.monthEffects.length;
  const drawCount = options.drawCount ?? bundle.draws.count;
  if (!Number.isInteger(drawCount) || drawCount < 1) throw new RangeError(`drawCount must be a whole number >= 1, got ${drawCount}`);
  const isKnownAirport = options.isKnownAirport ?? ((code: string) => findAirport(code) !== undefined);
  const airportIndex = new Map(bundle.airports.codes.map((c, i) => [c, i]));
  const routeRows = new Map<string, readonly number[]>();
  for (const row of bundle.routes.rows) routeRows.set(`${bundle.airports.codes[row[0]!]}-${bundle.airports.codes[row[1]!]}`, row);
  const globals = drawGlobals(bundle, drawCount);
  const newOrigin = unseenAirportSd(bundle.airports.originMean, bundle.airports.originSd, bundle.population.originSd);
  const newDestination = unseenAirportSd(bundle.airports.destinationMean, bundle.airports.destinationSd, bundle.population.destinationSd);
  const offset = bundle.departure.offsetMinutes;
  const info: PosteriorSourceInfo = { id: bundle.id, model: bundle.metadata.model, source: bundle.metadata.source };
  const cache = new Map<string, BundleRoutePosterior>();
  // Departure delays fitted directly (issue 7) come from their own bundle, not derived.
  const departureFit = bundle.departure.fitted === undefined ? null : createBundleSource(bundle.departure.fitted, options);

  function normaliseCode(code: string): string {
    const c = typeof code === 'string' ? code.trim().toUpperCase() : '';
    if (!airportIndex.has(c) && !isKnownAirport(c)) throw new Error(unknownAirportMessage(String(code)));
    return c;
  }

  /** Route-level parameter draws (drawCount x k), before any month effect. */
  function routeParameterDraws(origin: string, destination: string): { params: Float64Array; pooling: PoolingLevel; flights: number } {
    const rng: Rng = createRng(hashSeed(bundle.draws.seed, `${origin}-${destination}`));
    const params = new Float64Array(drawCount * k);
    const row = routeRows.get(`${origin}-${destination}`);
    if (row) {
      const z = new Float64Array(k);
      for (let s = 0; s < drawCount; s++) {
        for (let j = 0; j < k; j++) z[j] = rng.normal();
        for (let i = 0; i < k; i++) {
          let v = row[3 + i]!;
          const base = 3 + k + triangleSize(i);
          for (let j = 0; j <= i; j++) v += row[base + j]! * z[j]!;
          params[s * k + i] = v;
        }
      }
      return { params, pooling: 'route', flights: row[2]! };
    }
    const o = airportIndex.get(origin);
    const d = airportIndex.get(destination);
    const pooling: PoolingLevel = o !== undefined && d !== undefined ? 'airports' : 'population';
    const p = bundle.population;
    for (let s = 0; s < drawCount; s++) {
      for (let j = 0; j < k; j++) {
        const a = o !== undefined ? bundle.airports.originMean[o]![j]! + bundle.airports.originSd[o]![j]! * rng.normal() : newOrigin[j]! * rng.normal();
        const b = d !== undefined ? bundle.airports.destinationMean[d]![j]! + bundle.airports.destinationSd[d]![j]! * rng.normal() : newDestination[j]! * rng.normal();
        params[s * k + j] = p.mean[j]! + a + b + p.routeSd[j]! * rng.normal();
      }
    }
    return { params, pooling, flights: 0 };
  }

  function build(origin: string, destination: string, kind: DelayKind, monthLabel: string | null): BundleRoutePosterior {
    if (kind === 'departure' && departureFit) {
      const fitted = monthLabel === null ? departureFit.route(origin, destination, 'arrival') : departureFit.routeInMonth(origin, destination, 'arrival', monthLabel);
      return { ...fitted, kind: 'departure', derived: false };
    }
    const o = normaliseCode(origin);
    const d = normaliseCode(destination);
    const key = `${o}-${d}|${kind}|${monthLabel ?? ''}`;
    const hit = cache.get(key);
    if (hit) return hit;
    let monthRow: readonly number[] | null = null;
    if (monthLabel !== null) {
      const q = bundle.months.labels.indexOf(monthLabel);
      if (q < 0) throw new RangeError(`the bundle has no fitted month ${monthLabel}; it has ${bundle.months.labels.join(', ') || 'none'}`);
      monthRow = bundle.months.effects[q]!;
    }
    const { params, pooling, flights } = routeParameterDraws(o, d);
    for (let s = 0; s < drawCount; s++) {
      bundle.model.monthEffects.forEach((j, slot) => {
        params[s * k + j]! += monthRow ? monthRow[slot]! : globals.newMonth[s * m + slot]!;
      });
    }
    const shift = kind === 'departure' ? offset : 0;
    const distributions: (DelayDistribution | undefined)[] = new Array(drawCount);
    const posterior: BundleRoutePosterior = {
      origin: o,
      destination: d,
      kind,
      pooling,
      flights,
      derived: kind === 'departure' && bundle.departure.derived,
      drawCount,
      parameters(s: number): Float64Array {
        checkDraw(s);
        return params.subarray(s * k, (s + 1) * k);
      },
      draw(s: number): DelayDistribution {
        checkDraw(s);
        let dist = distributions[s];
        if (!dist) {
          dist = new TailMixtureDistribution(family, params.subarray(s * k, (s + 1) * k), globals.df[s]!, shift);
          distributions[s] = dist;
        }
        return dist;
      },
    };
    cache.set(key, posterior);
    return posterior;
  }

  function checkDraw(s: number): void {
    if (!Number.isInteger(s) || s < 0 || s >= drawCount) throw new RangeError(`draw index ${s} is outside 0..${drawCount - 1}`);
  }

  return {
    info,
    bundle,
    family,
    route: (origin, destination, kind) => build(origin, destination, kind, null),
    routeInMonth: (origin, destination, kind, monthLabel) => build(origin, destination, kind, monthLabel),
  };
}

/**
 * Parses a user-supplied bundle file's text.
 * @throws BundleFormatError for text that is not JSON or not a valid bundle
 */
export function parsePosteriorBundle(jsonText: string, options: BundleSourceOptions = {}): BundlePosteriorSource {
  let value: unknown;
  try {
    value = JSON.parse(jsonText);
  } catch (err) {
    throw new BundleFormatError(`not a valid route-posterior bundle: the file is not JSON (${err instanceof Error ? err.message : String(err)})`);
  }
  return createBundleSource(value, options);
}
