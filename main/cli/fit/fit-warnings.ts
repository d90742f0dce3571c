// Plain-language warnings for a fit whose diagnostics say its numbers should not be trusted.
//
// Thresholds: R-hat above 1.01 and bulk ESS below 100 per chain (Vehtari et al. 2021,
// "Rank-normalization, folding, and localization"); any divergent transition (Betancourt,
// "A Conceptual Introduction to Hamiltonian Monte Carlo", 2017); PSIS k-hat above 0.7
// (Yao et al. 2018, "Yes, but did it work?").
import type { FitDiagnostics, FitMethod } from '../../../shared/inference/fit-types';

function num(d: FitDiagnostics, key: string): number | undefined {
  const v = d[key];
  return typeof v === 'number' ? v : undefined;
}

export function fitWarnings(method: FitMethod, converged: boolean, d: FitDiagnostics): string[] {
  const out: string[] = [];
  if (method === 'nuts') {
    const divergences = num(d, 'divergences') ?? 0;
    if (divergences > 0) out.push(`${divergences} divergent transitions after warm-up: the sampler could not explore part of the posterior, so the estimates may be biased`);
    const rhat = num(d, 'maxRhat');
    if (rhat !== undefined && !(rhat <= 1.01)) out.push(`R-hat ${Number.isFinite(rhat) ? rhat.toFixed(3) : rhat} is above 1.01: the chains disagree; run longer (--warmup, --draws) before trusting these estimates`);
    const ess = num(d, 'minEssBulk');
    const chains = num(d, 'chains') ?? 1;
    if (ess !== undefined && !(ess >= 100 * chains)) out.push(`bulk effective sample size ${Math.round(ess)} is below ${100 * chains} (100 per chain): means and sds are imprecise`);
    const saturated = num(d, 'treeDepthSaturated') ?? 0;
    if (saturated > 0) out.push(`${saturated} iterations hit the tree-depth cap: sampling was inefficient`);
  } else if (!converged) {
    out.push(`${method} stopped at its iteration cap before meeting its convergence rule`);
  }
  const k = num(d, 'paretoK');
  if (k !== undefined && !(k <= 0.7)) {
    out.push(`Pareto k-hat ${Number.isFinite(k) ? k.toFixed(2) : k} is above 0.7: the variational approximation does not match the posterior well; compare with --method nuts`);
  }
  return out;
}
