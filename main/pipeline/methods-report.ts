// Renders the model comparison as Markdown, for the README's Methods section.
import type { HeldOutReport, PosteriorBundle } from '../../shared/delay/bundle/bundle-schema';

const START = '<!-- methods:start (written by npm run fit:default) -->';
const END = '<!-- methods:end -->';

function pct(x: number): string {
  return `${(100 * x).toFixed(x < 0.01 ? 3 : 2)}%`;
}

function signedPct(x: number | null): string {
  return x === null ? 'n/a' : `${x >= 0 ? '+' : ''}${(100 * x).toFixed(1)}%`;
}

function splitTable(reports: readonly HeldOutReport[], split: string): string[] {
  const rows = reports.filter((r) => r.split === split);
  if (rows.length === 0) return [];
  const thresholds = rows[0]!.pooled.map((p) => p.minutes);
  const lines = [
    `| candidate | nats/flight | ${thresholds.map((t) => `P(>${t}) pred / obs (rel. err.)`).join(' | ')} |`,
    `|---|---:|${thresholds.map(() => '---:').join('|')}|`,
  ];
  for (const r of rows) {
    lines.push(
      `| ${r.candidate} | ${r.natsPerFlight.toFixed(4)} | ${r.pooled.map((p) => `${pct(p.predicted)} / ${pct(p.observed)} (${signedPct(p.relativeError)})`).join(' | ')} |`,
    );
  }
  lines.push('', `90% intervals of the pooled P(>t) and whether they cover the observed value (${split}):`, '');
  lines.push(`| candidate | ${thresholds.map((t) => `P(>${t}) interval`).join(' | ')} |`, `|---|${thresholds.map(() => '---').join('|')}|`);
  for (const r of rows) lines.push(`| ${r.candidate} | ${r.pooled.map((p) => `${pct(p.interval[0])}-${pct(p.interval[1])} ${p.covered ? 'covers' : 'misses'}`).join(' | ')} |`);
  lines.push('', `Median over the 50 busiest routes of the absolute relative error (${split}):`, '');
  lines.push(`| candidate | ${thresholds.map((t) => `t = ${t}`).join(' | ')} |`, `|---|${thresholds.map(() => '---:').join('|')}|`);
  for (const r of rows) lines.push(`| ${r.candidate} | ${r.routeMedianAbsRelativeError.map((e) => (e.median === null ? 'n/a' : `${(100 * e.median).toFixed(1)}%`)).join(' | ')} |`);
  return lines;
}

function qqTableLines(report: HeldOutReport): string[] {
  if (!report.qq) return [];
  return [
    `| probability | observed quantile (min) | predicted quantile (min) |`,
    '|---:|---:|---:|',
    ...report.qq.map((q) => `| ${q.probability} | ${q.observedMinutes} | ${q.predictedMinutes.toFixed(1)} |`),
  ];
}

/** The Methods section's generated part for a bundle. */
export function methodsMarkdown(bundle: PosteriorBundle): string {
  const m = bundle.metadata;
  const shipped = m.comparison.find((r) => m.model.startsWith(`${r.candidate}:`) && r.split === 'held-out days');
  const lines = [
    START,
    `Shipped bundle \`${bundle.id}\`: ${m.flights.toLocaleString('en-US')} flights, ${m.routes.toLocaleString('en-US')} routes, ${m.airports} airports, ${m.dateRange.first} to ${m.dateRange.last}.`,
    '',
    `- Model: ${m.model}.`,
    `- Method: ${m.method}.`,
    `- Selection: ${m.selection || 'not recorded'}`,
    `- Cleaning: ${m.cleaning}`,
    `- Fit time of the shipped model (read excluded): ${(m.fitMs / 1000).toFixed(1)} s.`,
    '',
    '### Held-out days (every fifth calendar day held out, fitted on the rest)',
    '',
    ...splitTable(m.comparison, 'held-out days'),
    '',
    '### Future month (fitted January-May, June predicted)',
    '',
    ...splitTable(m.comparison, 'future month'),
    '',
    ...(shipped ? ['### QQ table of the shipped candidate on the held-out days', '', ...qqTableLines(shipped), ''] : []),
    ...m.notes.map((n) => `- ${n}`),
    END,
  ];
  return lines.join('\n');
}

/** Replaces the generated part of README.md's Methods section (between the markers), or appends it. */
export function replaceMethodsSection(readme: string, generated: string): string {
  const a = readme.indexOf(START);
  const b = readme.indexOf(END);
  if (a >= 0 && b > a) return readme.slice(0, a) + generated + readme.slice(b + END.length);
  return `${readme.trimEnd()}\n\n## Methods: the bundled route posteriors\n\n${generated}\n`;
}
