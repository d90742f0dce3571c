// Benchmark of the bundled-posterior fit (issue 8 target: the full 3,000,000-row fit, end to
// end: read, compress, fit, write, <= 60 s; goal 15 s), with the parquet read timed alone.
//
// It refits the candidate the committed bundle ships and writes to a temporary file, so the
// committed bundle is left alone. The held-out comparison of `npm run fit:default` is not timed here.
import { existsSync, readFileSync } from 'node:fs';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { validateBundle } from '../../../shared/delay/bundle/bundle-schema';
import { fitBundle, type Candidate } from '../../../shared/delay/bundle/fit-bundle';
import { cleanFlights, dayNumber } from '../../../shared/delay/evaluation/flight-columns';
import { CANDIDATES, SAMPLE } from '../../pipeline/candidates';
import { defaultFlightsPath, readFlights } from '../../pipeline/read-flights';
import type { BenchRow, BenchSuite } from '../suite';

function shippedCandidate(): Candidate {
  const file = path.resolve('shared/data/route-posteriors.json');
  if (existsSync(file)) {
    const model = validateBundle(JSON.parse(readFileSync(file, 'utf8'))).metadata.model;
    const found = CANDIDATES.find((c) => model.startsWith(`${c.name}:`));
    if (found) return found;
  }
  return CANDIDATES[CANDIDATES.length - 1]!;
}

export const bundleSuite: BenchSuite = {
  name: 'bundle',
  run: async (log) => {
    const rows: BenchRow[] = [];
    const input = defaultFlightsPath();
    const readStart = performance.now();
    await readFlights(input);
    rows.push({ name: 'read flights-3m.parquet (columns)', ms: performance.now() - readStart, notes: '3,000,000 rows, 4 columns' });
    const candidate = shippedCandidate();
    const dir = await mkdtemp(path.join(os.tmpdir(), 'layline-bench-bundle-'));
    try {
      const start = performance.now();
      const flights = await readFlights(input);
      const { keep } = cleanFlights(flights, dayNumber(2001, 1, 1), dayNumber(2001, 6, 30));
      const fitted = await fitBundle(flights, keep, candidate, {
        seed: 20010101,
        maxIterations: 250,
        metadata: { id: 'bench', ...SAMPLE, dateRange: { ...SAMPLE.dateRange }, createdAt: new Date().toISOString() },
      });
      const text = JSON.stringify(fitted.bundle);
      await writeFile(path.join(dir, 'route-posteriors.json'), text);
      const ms = performance.now() - start;
      const d = fitted.bundle.metadata.diagnostics;
      log(`${candidate.name}: ${fitted.bundle.metadata.flights} flights, ${d.triples} triples, dimension ${d.dimension}, ${d.iterations} L-BFGS iterations (converged: ${d.converged})`);
      rows.push({
        name: `full fit end to end (${candidate.name})`,
        ms,
        targetMs: 60_000,
        notes: `warm start ${d.warmStartMs} ms, MAP ${d.mapMs} ms, bundle ${(text.length / 1e6).toFixed(2)} MB; goal 15,000 ms`,
      });
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
    return rows;
  },
};
