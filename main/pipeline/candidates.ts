// The candidate models compared for the bundled posteriors, and the data set's provenance.
import type { Candidate } from '../../shared/delay/bundle/fit-bundle';

export const CANDIDATES: readonly Candidate[] = [
  {
    name: 'gumbel',
    family: 'gumbel',
    monthEffects: [],
    description: 'one Gumbel per route (the published baseline), location and log-scale pooled toward origin and destination effects',
  },
  {
    name: 'gumbel-mixture',
    family: 'gumbel-gumbel',
    monthEffects: [],
    description: 'typical Gumbel plus a wider disrupted Gumbel per route, every parameter including the logit weight pooled hierarchically',
  },
  {
    name: 'gumbel-lomax+month',
    family: 'gumbel-lomax',
    monthEffects: [0, 2, 4],
    description:
      'typical Gumbel plus a heavy-tailed Lomax (Pareto II) disrupted component per route, its tail index a pooled route parameter, ' +
      'with calendar-month random effects on the typical location, the disrupted scale and the logit weight; a future month draws a new effect',
  },
  {
    name: 'gumbel-3+month',
    family: 'gumbel-gumbel-lomax',
    monthEffects: [0, 2, 4, 7],
    description:
      'typical Gumbel, wider disrupted Gumbel and a severe heavy-tailed Lomax (Pareto II) component per route, every parameter pooled hierarchically, ' +
      'with calendar-month random effects on the typical and disrupted locations, the non-typical weight and the severe share; a future month draws a new effect',
  },
];

export const SAMPLE = {
  title: 'Route posteriors from the BTS on-time sample, January-June 2001',
  source: 'U.S. Bureau of Transportation Statistics On-Time Performance data, 3,000,000-flight sample data/flights-3m.parquet from the npm package vega-datasets',
  license: 'vega-datasets is BSD-3-Clause; the underlying BTS data are U.S. government public data',
  dateRange: { first: '2001-01-01', last: '2001-06-30' },
} as const;
