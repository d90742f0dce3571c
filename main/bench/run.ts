// `npm run bench [suite-name…]`: runs the benchmark suites and prints one table.
import os from 'node:os';
import type { BenchRow } from './suite';
import { suites } from './suites';

async function main(): Promise<void> {
  const wanted = process.argv.slice(2);
  const chosen = wanted.length ? suites.filter((s) => wanted.includes(s.name)) : suites;
  if (wanted.length && chosen.length !== wanted.length) {
    process.stderr.write(`unknown suite; available: ${suites.map((s) => s.name).join(', ')}\n`);
    process.exitCode = 2;
    return;
  }
  const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
  process.stdout.write(`Layline benchmarks on ${os.cpus().length} x ${cpu}, Node ${process.version}. Figures depend on the machine.\n\n`);
  const rows: (BenchRow & { suite: string })[] = [];
  for (const suite of chosen) {
    process.stdout.write(`## ${suite.name}\n`);
    for (const row of await suite.run((line) => process.stdout.write(`  ${line}\n`))) rows.push({ ...row, suite: suite.name });
  }
  process.stdout.write('\n| suite | case | ms | target ms | within target | notes |\n|---|---|---:|---:|---|---|\n');
  for (const r of rows) {
    const within = r.targetMs === undefined ? '' : r.ms <= r.targetMs ? 'yes' : 'NO';
    process.stdout.write(`| ${r.suite} | ${r.name} | ${r.ms.toFixed(1)} | ${r.targetMs ?? ''} | ${within} | ${r.notes ?? ''} |\n`);
  }
}

void main();
