// Benchmark of the delay-history fit (issue 7 target: 1,000,000 rows in the public layout,
// from file to saved bundle, <= 15 s; goal 5 s), of the import alone, and of the streaming
// import's memory (issue 7: 5,000,000 rows ingested in <= 1 GB).
//
// The input is generated into a temporary folder in the BTS prezipped column layout
// (main/history/synthetic-history.ts); generating it is not timed.
import { mkdtemp, rm, stat } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { dayNumber } from '../../../shared/history/cells';
import { defaultHistoryCandidate } from '../../../shared/history/default-candidate';
import { fitRouteHistory } from '../../../shared/history/history-fit';
import { readHistoryFile } from '../../history/read-history-file';
import { writeSyntheticBtsCsv } from '../../history/synthetic-history';
import { writeFileAtomic } from '../../workspace/atomic-write';
import type { BenchRow, BenchSuite } from '../suite';

const ROWS = 1_000_000;
const BIG_ROWS = 5_000_000;
const MEMORY_LIMIT_MB = 1024;

export const historySuite: BenchSuite = {
  name: 'history',
  run: async (log) => {
    const dir = await mkdtemp(path.join(os.tmpdir(), 'layline-bench-history-'));
    try {
      const input = path.join(dir, 'on-time.csv');
      const generated = await writeSyntheticBtsCsv(input, { rows: ROWS, seed: 2026, firstDay: dayNumber(2024, 1, 1), days: 182 });
      const bytes = (await stat(input)).size;
      log(`generated ${ROWS} rows (${(bytes / 1e6).toFixed(0)} MB, ${generated.routes.length} routes) in the BTS prezipped layout`);

      const readStart = performance.now();
      const read = await readHistoryFile(input);
      const readMs = performance.now() - readStart;
      log(`import: ${readMs.toFixed(0)} ms, ${read.table.summary.flights} flights, ${read.table.summary.cancelled} cancelled, ${read.table.summary.diverted} diverted; rss ${(process.memoryUsage().rss / 1e6).toFixed(0)} MB`);

      const candidate = defaultHistoryCandidate();
      const from = 'the default bundle\'s model';
      const out = path.join(dir, 'bundle.json');
      const start = performance.now();
      const again = await readHistoryFile(input);
      const result = await fitRouteHistory(again.table, {
        method: 'map',
        seed: 1,
        candidate,
        metadata: { id: 'bench', title: 'bench', source: 'synthetic BTS layout', license: 'generated', createdAt: new Date().toISOString() },
      });
      const text = JSON.stringify(result.bundle);
      await writeFileAtomic(out, text);
      const totalMs = performance.now() - start;
      const notes = `${candidate.name} (${from}), MAP; held-out ${result.arrival.natsPerFlight.toFixed(3)} nats/flight; P(arr>60) obs ${result.arrival.pooled[2]!.observed.toFixed(4)} pred ${result.arrival.pooled[2]!.predicted.toFixed(4)}; bundle ${(text.length / 1e6).toFixed(2)} MB`;
      log(`file to saved bundle: ${totalMs.toFixed(0)} ms; ${notes}`);
      // Memory last, so the 1 GB file exists only briefly. maxRSS is the process's peak so far,
      // generation and the fit above included: an upper bound on what the import needed.
      const bigInput = path.join(dir, 'on-time-5m.csv');
      await rm(input, { force: true });
      await writeSyntheticBtsCsv(bigInput, { rows: BIG_ROWS, seed: 2027, firstDay: dayNumber(2024, 1, 1), days: 365 });
      const bigBytes = (await stat(bigInput)).size;
      const bigStart = performance.now();
      const big = await readHistoryFile(bigInput);
      const bigMs = performance.now() - bigStart;
      const peakMb = process.resourceUsage().maxRSS / 1024;
      log(`import of ${BIG_ROWS} rows (${(bigBytes / 1e6).toFixed(0)} MB): ${bigMs.toFixed(0)} ms, ${big.table.summary.flights} flights; peak RSS of the whole run ${peakMb.toFixed(0)} MB`);
      const rows: BenchRow[] = [
        { name: `import ${BIG_ROWS} rows (CSV), peak memory`, ms: bigMs, notes: `peak RSS ${peakMb.toFixed(0)} MB of the whole bench process (limit ${MEMORY_LIMIT_MB} MB: ${peakMb <= MEMORY_LIMIT_MB ? 'within' : 'OVER'}); ${(bigBytes / 1e6).toFixed(0)} MB file` },
        { name: `import ${ROWS} rows (CSV)`, ms: readMs, notes: `${((bytes / 1e6) / (readMs / 1000)).toFixed(0)} MB/s` },
        { name: `${ROWS} rows, file to saved bundle`, ms: totalMs, targetMs: 15_000, notes: `goal 5000 ms; ${notes}` },
      ];
      return rows;
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  },
};
