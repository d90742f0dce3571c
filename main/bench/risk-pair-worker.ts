// The benchmark's pair worker (main/scoring/pair-workers.ts): 'synthetic' is a fresh synthetic
// source per request, as the single-thread case makes one per run; 'bundled' the default bundle.
import { loadDefaultPosteriorSource } from '../../shared/delay/bundle/default-bundle';
import { servePairRequests } from '../scoring/pair-worker-host';
import { benchSource } from './suites/risk';

servePairRequests((spec) => {
  if (spec === 'synthetic') return benchSource();
  if (spec === 'bundled') return loadDefaultPosteriorSource();
  throw new Error(`unknown benchmark source ${JSON.stringify(spec)}`);
});
