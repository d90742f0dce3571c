// `layline fit --model grouped`: one Gumbel per group, partially pooled (the core engine's
// grouped model), read from a group column and a value column.
import { createGroupedModel } from '../../../shared/delay/models/grouped';
import type { HierarchicalDelayModel } from '../../../shared/delay/models/hierarchical-delay';
import { groupHierarchyBlocks, observationsPerGroup } from '../../../shared/inference/centred-view';
import type { FitResult } from '../../../shared/inference/fit-types';
import type { Rng } from '../../../shared/inference/rng';
import { collapseWeighted } from '../../../shared/inference/weighted-data';
import { CliFailure, UsageError } from '../io';
import { findColumn, numberCell, textCell } from './csv-columns';
import { RunningMoments } from '../../../shared/inference/diagnostics/running-moments';
import type { FitInput, FitModelAdapter, FlagValues, Moments, PreparedFit } from './fit-model';
import { posteriorDraws, type PosteriorDraws } from './posterior-draws';

export interface GroupSummary {
  readonly group: string;
  readonly location: Moments;
  readonly scale: Moments;
}

const GROUP_DEFAULTS = ['group', 'g'] as const;
const VALUE_DEFAULTS = ['value', 'y', 'delay'] as const;

function formatMoments(m: Moments): string {
  return `${m.mean.toFixed(2).padStart(9)} ± ${m.sd.toFixed(2).padEnd(7)}`;
}

/** The hierarchy blocks that NUTS and the Laplace approximation treat in centred form. */
function groupedCentredBlocks(model: HierarchicalDelayModel) {
  const { layout } = model;
  return groupHierarchyBlocks([layout.location, layout.logScale, layout.logitWeight], observationsPerGroup(model.data));
}

/**
 * Posterior mean and sd of each group's Gumbel location and scale, averaged over the fit's
 * draws. MAP reports the mode itself as the mean, with sds from its Laplace draws.
 */
export function groupPosteriorMoments(model: HierarchicalDelayModel, result: FitResult, rng: Rng): { location: Moments; scale: Moments }[] {
  return momentsFromDraws(model, result, posteriorDraws(model, result, rng, groupedCentredBlocks(model)));
}

function momentsFromDraws(model: HierarchicalDelayModel, result: FitResult, { draws, count }: PosteriorDraws): { location: Moments; scale: Moments }[] {
  const groupCount = model.groupCount;
  const acc = new RunningMoments(2 * groupCount);
  const theta = new Float64Array(model.dim);
  const values = new Float64Array(2 * groupCount);
  for (let s = 0; s < count; s++) {
    theta.set(draws.subarray(s * model.dim, (s + 1) * model.dim));
    for (let g = 0; g < groupCount; g++) {
      const p = model.groupParameters(theta, g);
      values[2 * g] = p.location;
      values[2 * g + 1] = p.scale;
    }
    acc.push(values);
  }
  const moments = (slot: number): Moments => ({ mean: acc.mean(slot), sd: count > 1 ? Math.sqrt(acc.variance(slot)) : 0 });
  return Array.from({ length: groupCount }, (_, g) => {
    const location = moments(2 * g);
    const scale = moments(2 * g + 1);
    if (result.method !== 'map') return { location, scale };
    const mode = model.groupParameters(result.mean, g);
    return { location: { mean: mode.location, sd: location.sd }, scale: { mean: mode.scale, sd: scale.sd } };
  });
}

async function prepare(input: FitInput, flags: FlagValues): Promise<PreparedFit> {
  const table = await input.readTable();
  const { source } = input;
  const groupColumn = findColumn(table, flags['group-column'] as string | undefined, GROUP_DEFAULTS, '--group-column', source);
  const valueColumn = findColumn(table, flags['value-column'] as string | undefined, VALUE_DEFAULTS, '--value-column', source);
  if (groupColumn === valueColumn) throw new CliFailure(`--group-column and --value-column both name column '${table.header[groupColumn]}'`);
  const n = table.rowCount;
  if (n < 2) throw new CliFailure(`${source} has ${n === 0 ? 'no observations' : 'a single observation'}: a fit needs at least 2`);
  const labels: string[] = [];
  const index = new Map<string, number>();
  const group = new Int32Array(n);
  const value = new Float64Array(n);
  const groupPlace = { source, line: 0, columnName: table.header[groupColumn]! };
  const valuePlace = { source, line: 0, columnName: table.header[valueColumn]! };
  let i = 0;
  table.forEachRow((cells, line) => {
    groupPlace.line = valuePlace.line = line;
    const label = textCell(cells, groupColumn, groupPlace);
    let g = index.get(label);
    if (g === undefined) {
      g = labels.length;
      index.set(label, g);
      labels.push(label);
    }
    group[i] = g;
    value[i] = numberCell(cells, valueColumn, valuePlace);
    i++;
  });
  const likelihood = (flags['likelihood'] as string | undefined) ?? 'point';
  if (likelihood !== 'point' && likelihood !== 'interval') throw new UsageError(`fit: --likelihood must be point or interval, got '${likelihood}'`);
  // Values rounded to the minute stand for the interval (v - 0.5, v + 0.5].
  const model = createGroupedModel(collapseWeighted(group, value, labels.length), { intervalHalfWidth: likelihood === 'interval' ? 0.5 : 0 });
  const centredBlocks = groupedCentredBlocks(model);
  return {
    model,
    observations: n,
    modelDiagnostics: { groups: labels.length, likelihood: likelihood === 'interval' ? 'interval (rounded to the minute)' : 'point' },
    nutsCentredBlocks: centredBlocks,
    summarise(result: FitResult, rng: Rng) {
      const source = posteriorDraws(model, result, rng, centredBlocks);
      const moments = momentsFromDraws(model, result, source);
      const groups: GroupSummary[] = labels.map((label, g) => ({ group: label, ...moments[g]! }));
      const width = Math.max(5, ...labels.map((l) => l.length));
      const lines = [
        `${'group'.padEnd(width)}  ${'location (min)'.padStart(19)}  ${'scale (min)'.padStart(19)}`,
        ...groups.map((s) => `${s.group.padEnd(width)}  ${formatMoments(s.location)}  ${formatMoments(s.scale)}`),
      ];
      return { json: { groups }, text: lines.join('\n') + '\n', diagnostics: { summaryDraws: source.source } };
    },
  };
}

export const groupedFitModel: FitModelAdapter = {
  name: 'grouped',
  summary: 'a Gumbel delay per group, partially pooled toward population values',
  flagUsage: [
    `  --group-column NAME   the group column (default: ${GROUP_DEFAULTS.map((c) => `'${c}'`).join(' or ')})`,
    `  --value-column NAME   the value column, e.g. delay minutes (default: ${VALUE_DEFAULTS.map((c) => `'${c}'`).join(', ')})`,
    '  --likelihood KIND     point (default): the density at each value; interval: each value v',
    '                        stands for (v - 0.5, v + 0.5], exact for delays rounded to the minute',
  ],
  flags: { 'group-column': { type: 'string' }, 'value-column': { type: 'string' }, likelihood: { type: 'string' } },
  prepare,
};
