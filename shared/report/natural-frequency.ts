// Probabilities as natural frequencies ("about 1 in 12"), the form people without
// statistics read correctly.
//
// Gigerenzer & Hoffrage, "How to improve Bayesian reasoning without instruction:
// frequency formats" (Psychological Review, 1995) is the reason for the form; the rounding
// steps below are our own choice, picked so that no phrase claims more precision than a
// Monte Carlo estimate has.

export interface NaturalFrequency {
  /** "1" in "about 1 in 12". */
  readonly count: number;
  /** "12" in "about 1 in 12". */
  readonly outOf: number;
  /** 'about' for a rounded value; 'fewer-than' / 'more-than' at the ends of the scale. */
  readonly qualifier: 'about' | 'fewer-than' | 'more-than';
  /** The phrase, e.g. "about 1 in 12", "fewer than 1 in 1,000", "about 7 in 10". */
  readonly text: string;
}

/** The rarest event we put a number on; rarer ones read "fewer than 1 in 1,000". */
const RAREST_OUT_OF = 1000;

/**
 * Rounds a denominator to a step that matches how well it is known.
 *
 * Up to 25 every integer; then steps of 5, 10 and 50, so that 1 in 37 reads "1 in 35"
 * and 1 in 430 reads "1 in 450". The rounded value is always within 10% of n.
 */
export function roundOutOf(n: number): number {
  if (!(n >= 1)) return 1;
  const step = n <= 25 ? 1 : n <= 100 ? 5 : n <= 250 ? 10 : 50;
  return Math.max(1, Math.round(n / step) * step);
}

function groupDigits(n: number): string {
  return String(n).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

function phrase(qualifier: NaturalFrequency['qualifier'], count: number, outOf: number): NaturalFrequency {
  const lead = qualifier === 'about' ? 'about' : qualifier === 'fewer-than' ? 'fewer than' : 'more than';
  return { count, outOf, qualifier, text: `${lead} ${groupDigits(count)} in ${groupDigits(outOf)}` };
}

/**
 * The natural frequency of an event of probability p.
 *
 * Rare events (p <= 1/4) read "about 1 in N"; middling ones "about K in 10"; near-certain
 * ones "about N-1 in N", so the small chance of the opposite stays visible.
 * Throws a RangeError for NaN or p outside [0, 1].
 * @example naturalFrequency(1 / 12).text // "about 1 in 12"
 * @example naturalFrequency(0.31).text // "about 3 in 10"
 * @example naturalFrequency(0.0004).text // "fewer than 1 in 1,000"
 */
export function naturalFrequency(p: number): NaturalFrequency {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`naturalFrequency: probability must be in [0, 1], got ${p}`);
  if (p < 1 / RAREST_OUT_OF) return phrase('fewer-than', 1, RAREST_OUT_OF);
  if (p > 1 - 1 / RAREST_OUT_OF) return phrase('more-than', RAREST_OUT_OF - 1, RAREST_OUT_OF);
  if (p <= 0.25) return phrase('about', 1, roundOutOf(1 / p));
  if (p >= 0.75) {
    const outOf = roundOutOf(1 / (1 - p));
    // Ten or fewer reads better on the tens scale ("about 8 in 10" rather than "about 4 in 5").
    if (outOf > 10) return phrase('about', outOf - 1, outOf);
  }
  return phrase('about', Math.round(p * 10), 10);
}

/**
 * How often a connection of probability pMake is missed, as a phrase a traveler reads.
 * @example missFrequency(0.92) // "about 1 in 12"
 */
export function missFrequency(pMake: number): string {
  return naturalFrequency(1 - pMake).text;
}
