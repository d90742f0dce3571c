import { describe, expect, it } from 'vitest';
import { fitWarnings } from '../../../../main/cli/fit/fit-warnings';

describe('fitWarnings', () => {
  it('warns on divergences, R-hat above 1.01, low ESS and tree-depth hits for NUTS (Vehtari et al. 2021)', () => {
    const w = fitWarnings('nuts', false, { chains: 4, divergences: 3, maxRhat: 1.05, minEssBulk: 120, treeDepthSaturated: 2 });
    expect(w).toHaveLength(4);
    expect(w[0]).toMatch(/^3 divergent transitions/);
    expect(w[1]).toMatch(/R-hat 1\.050 is above 1\.01/);
    expect(w[2]).toMatch(/bulk effective sample size 120 is below 400/);
    expect(w[3]).toMatch(/2 iterations hit the tree-depth cap/);
    expect(fitWarnings('nuts', true, { chains: 4, divergences: 0, maxRhat: 1.002, minEssBulk: 1500, treeDepthSaturated: 0 })).toEqual([]);
    expect(fitWarnings('nuts', false, { chains: 1, maxRhat: NaN })[0]).toMatch(/R-hat NaN/);
  });

  it('warns when PSIS k-hat exceeds 0.7 (Yao et al. 2018) or the iteration cap stopped the fit', () => {
    expect(fitWarnings('advi', true, { paretoK: 0.86 })).toEqual(['Pareto k-hat 0.86 is above 0.7: the variational approximation does not match the posterior well; compare with --method nuts']);
    expect(fitWarnings('svi', true, { paretoK: 0.4 })).toEqual([]);
    expect(fitWarnings('map', false, {})).toEqual(['map stopped at its iteration cap before meeting its convergence rule']);
  });
});
