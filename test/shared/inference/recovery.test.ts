// Recovery of known group parameters by every algorithm, on the same data (STYLE.md section 5:
// one matrix over algorithms). The reference is the simulation truth itself.
import { beforeAll, describe, expect, it } from 'vitest';
import { groupHierarchyBlocks, observationsPerGroup } from '../../../shared/inference/centred-view';
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import type { HierarchicalDelayModel } from '../../../shared/delay/models/hierarchical-delay';
import type { FitMethod, FitResult } from '../../../shared/inference/fit-types';
import { createRng } from '../../../shared/inference/rng';
import { simulateGroupedDelays, type GumbelGroup } from '../../../shared/inference/simulation/grouped-delays';
import { runMethod } from '../../../main/cli/fit/fit-methods';
import { groupPosteriorMoments } from '../../../main/cli/fit/grouped-fit-model';

// Ten invented groups, 1,000 draws each: 10,000 draws in all (the 1,000,000-draw case is in
// the inference bench suite).
const TRUTH: GumbelGroup[] = [
  { location: -3, scale: 5 },
  { location: 0, scale: 7 },
  { location: 2, scale: 8 },
  { location: 5, scale: 10 },
  { location: 8, scale: 12 },
  { location: 10, scale: 14 },
  { location: 14, scale: 16 },
  { location: 18, scale: 20 },
  { location: 25, scale: 25 },
  { location: 32, scale: 30 },
];
const PER_GROUP = 1000;

// Stated tolerances. With n = 1000 draws a group's location estimate has sd ~1.05 beta / sqrt(n)
// = 0.033 beta and its scale estimate a relative sd of ~0.78 / sqrt(n) = 0.025 (Gumbel Fisher
// information; value from memory): 0.15 beta and 10% are more than 4 sds, so a pass is not luck,
// and a biased or unconverged fit fails.
const LOCATION_TOLERANCE_IN_SCALES = 0.15;
const SCALE_RELATIVE_TOLERANCE = 0.1;

let model: HierarchicalDelayModel;
const fits = new Map<FitMethod, { result: FitResult; groups: ReturnType<typeof groupPosteriorMoments> }>();

async function fitWith(method: FitMethod) {
  const cached = fits.get(method);
  if (cached) return cached;
  const { layout } = model;
  const blocks = groupHierarchyBlocks([layout.location, layout.logScale], observationsPerGroup(model.data));
  // NUTS: two chains of 500 + 500 keep the unit suite fast; the bench runs 1,000 + 1,000.
  const result = await runMethod(method, model, { rng: createRng(77), chains: 2, warmup: 500, draws: 500 }, blocks);
  const entry = { result, groups: groupPosteriorMoments(model, result, createRng(78)) };
  fits.set(method, entry);
  return entry;
}

beforeAll(() => {
  model = createGroupedModel(simulateGroupedDelays(TRUTH, PER_GROUP, createRng(2026)));
});

describe.each(['map', 'advi', 'svi', 'nuts'] as const)('recovery of 10 groups x 1,000 Gumbel draws by %s', (method) => {
  it(`puts every location within ${LOCATION_TOLERANCE_IN_SCALES} scales and every scale within ${SCALE_RELATIVE_TOLERANCE * 100}% of the truth`, async () => {
    const { groups, result } = await fitWith(method);
    expect(result.method).toBe(method);
    TRUTH.forEach((t, g) => {
      const est = groups[g]!;
      const locErr = Math.abs(est.location.mean - t.location) / t.scale;
      const scaleErr = Math.abs(est.scale.mean / t.scale - 1);
      expect(locErr, `group ${g}: location ${est.location.mean} vs ${t.location} (error in scales, tolerance ${LOCATION_TOLERANCE_IN_SCALES})`).toBeLessThan(LOCATION_TOLERANCE_IN_SCALES);
      expect(scaleErr, `group ${g}: scale ${est.scale.mean} vs ${t.scale} (relative error, tolerance ${SCALE_RELATIVE_TOLERANCE})`).toBeLessThan(SCALE_RELATIVE_TOLERANCE);
    });
  });
});

describe('NUTS and ADVI on the same data', () => {
  it.each(['nuts', 'map'] as const)('%s reports posterior sds of the size the data supports (within a factor 2 of the asymptotic sd)', async (method) => {
    // MAP's sds come from the full Laplace approximation in centred coordinates (main/cli/fit/posterior-draws.ts).
    const { groups } = await fitWith(method);
    TRUTH.forEach((t, g) => {
      const asymptotic = (1.05 * t.scale) / Math.sqrt(PER_GROUP);
      const ratio = groups[g]!.location.sd / asymptotic;
      expect(ratio, `group ${g}: location sd ${groups[g]!.location.sd} vs ~${asymptotic.toFixed(3)}`).toBeGreaterThan(0.5);
      expect(ratio).toBeLessThan(2);
    });
  });

  it('agree on every posterior mean to within one NUTS posterior sd', async () => {
    const nuts = await fitWith('nuts');
    const advi = await fitWith('advi');
    expect(nuts.result.diagnostics['divergences']).toBe(0);
    expect(nuts.result.diagnostics['maxRhat'] as number).toBeLessThan(1.02);
    TRUTH.forEach((_, g) => {
      const n = nuts.groups[g]!;
      const a = advi.groups[g]!;
      expect(Math.abs(n.location.mean - a.location.mean), `group ${g} location: NUTS ${n.location.mean}, ADVI ${a.location.mean}`).toBeLessThan(n.location.sd);
      expect(Math.abs(n.scale.mean - a.scale.mean), `group ${g} scale: NUTS ${n.scale.mean}, ADVI ${a.scale.mean}`).toBeLessThan(n.scale.sd);
    });
  });
});
