// Inference benchmarks (issue 4): ADVI, SVI and MAP on 10 groups x 1,000,000 delays, NUTS
// (1,000 warm-up + 1,000 draws) on 10 groups x 10,000 delays, each with its recovery error
// against the simulation truth. Data generation and collapsing are outside the timings.
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import type { HierarchicalDelayModel } from '../../../shared/delay/models/hierarchical-delay';
import { groupHierarchyBlocks, observationsPerGroup } from '../../../shared/inference/centred-view';
import type { FitMethod, FitResult } from '../../../shared/inference/fit-types';
import { createRng } from '../../../shared/inference/rng';
import { simulateGroupedDelays, type GumbelGroup } from '../../../shared/inference/simulation/grouped-delays';
import { runMethod, type MethodOptions } from '../../cli/fit/fit-methods';
import { groupPosteriorMoments } from '../../cli/fit/grouped-fit-model';
import type { BenchRow, BenchSuite } from '../suite';

const TRUTH: GumbelGroup[] = Array.from({ length: 10 }, (_, g) => ({ location: -3 + 3.5 * g, scale: 5 + 2.5 * g }));

interface Case {
  readonly name: string;
  readonly method: FitMethod;
  readonly totalDraws: number;
  readonly targetMs?: number;
  readonly options?: Partial<MethodOptions>;
  readonly runs: number;
}

const CASES: readonly Case[] = [
  { name: 'ADVI, 10 groups x 100,000 delays (1,000,000)', method: 'advi', totalDraws: 1_000_000, targetMs: 1000, runs: 3 },
  { name: 'SVI, 10 groups x 100,000 delays (1,000,000)', method: 'svi', totalDraws: 1_000_000, targetMs: 1000, runs: 3 },
  { name: 'full-rank ADVI, 1,000,000 delays', method: 'fullrank', totalDraws: 1_000_000, runs: 3 },
  { name: 'MAP, 1,000,000 delays', method: 'map', totalDraws: 1_000_000, runs: 3 },
  { name: 'NUTS 1 chain, 1,000 + 1,000, 10 groups x 1,000 (10,000 delays)', method: 'nuts', totalDraws: 10_000, targetMs: 3000, options: { chains: 1 }, runs: 1 },
  { name: 'NUTS 4 chains, 1,000 + 1,000 each, 10,000 delays', method: 'nuts', totalDraws: 10_000, options: { chains: 4 }, runs: 1 },
];

/** Worst location error (in units of the true scale) and worst relative scale error over groups. */
function recoveryError(model: HierarchicalDelayModel, result: FitResult): { location: number; scale: number } {
  const moments = groupPosteriorMoments(model, result, createRng(99));
  let location = 0;
  let scale = 0;
  TRUTH.forEach((t, g) => {
    location = Math.max(location, Math.abs(moments[g]!.location.mean - t.location) / t.scale);
    scale = Math.max(scale, Math.abs(moments[g]!.scale.mean / t.scale - 1));
  });
  return { location, scale };
}

export const inferenceSuite: BenchSuite = {
  name: 'inference',
  run: async (log) => {
    const rows: BenchRow[] = [];
    const models = new Map<number, HierarchicalDelayModel>();
    for (const c of CASES) {
      let model = models.get(c.totalDraws);
      if (!model) {
        model = createGroupedModel(simulateGroupedDelays(TRUTH, c.totalDraws / TRUTH.length, createRng(c.totalDraws)));
        models.set(c.totalDraws, model);
        log(`${c.totalDraws.toLocaleString('en')} delays collapse to ${model.data.group.length} weighted triples`);
      }
      const blocks = groupHierarchyBlocks([model.layout.location, model.layout.logScale], observationsPerGroup(model.data));
      const times: number[] = [];
      const cpuTimes: number[] = [];
      let last: FitResult | undefined;
      for (let r = 0; r < c.runs; r++) {
        const start = performance.now();
        const cpuStart = process.cpuUsage();
        last = await runMethod(c.method, model, { rng: createRng(10 + r), ...c.options }, blocks);
        times.push(performance.now() - start);
        const cpu = process.cpuUsage(cpuStart);
        cpuTimes.push((cpu.user + cpu.system) / 1000);
      }
      times.sort((a, b) => a - b);
      cpuTimes.sort((a, b) => a - b);
      const ms = times[Math.floor(times.length / 2)]!;
      // CPU time next to wall time: on a shared, loaded machine wall time overstates the cost.
      const cpuMs = cpuTimes[Math.floor(cpuTimes.length / 2)]!;
      const result = last!;
      const err = recoveryError(model, result);
      const extra =
        c.method === 'nuts'
          ? `, divergences ${result.diagnostics['divergences']}, max R-hat ${(result.diagnostics['maxRhat'] as number).toFixed(3)}, min bulk ESS ${Math.round(result.diagnostics['minEssBulk'] as number)}, gradients ${result.diagnostics['gradientEvaluations']}`
          : `, converged ${result.converged}`;
      const notes = `CPU ${cpuMs.toFixed(0)} ms, iterations ${result.iterations}, worst location error ${err.location.toFixed(3)} scales, worst scale error ${(100 * err.scale).toFixed(1)}%${extra}`;
      log(`${c.name}: ${ms.toFixed(0)} ms (median of ${c.runs}); ${notes}`);
      rows.push({ name: c.name, ms, targetMs: c.targetMs, notes });
    }
    return rows;
  },
};
