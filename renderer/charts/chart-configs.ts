// The chart.js configurations of Layline's charts, built from engine output and the
// theme's colours. Pure: the same inputs give the same configuration.
import type { ChartConfiguration } from 'chart.js';
import type { ConnectionCurve, GroupView, TripView } from '../../shared/api/analysis-schema';

export interface ChartColors {
  readonly ink: string;
  readonly muted: string;
  readonly grid: string;
  readonly meets: string;
  readonly near: string;
  readonly below: string;
  readonly accent: string;
  readonly band: string;
}

const common = (colors: ChartColors) => ({
  responsive: true,
  maintainAspectRatio: false,
  animation: false as const,
  color: colors.ink,
  plugins: { legend: { labels: { color: colors.ink, boxWidth: 14 } } },
});

function axis(colors: ChartColors, title: string, extra: Record<string, unknown> = {}) {
  return { title: { display: true, text: title, color: colors.ink }, ticks: { color: colors.muted }, grid: { color: colors.grid }, ...extra };
}

function verticalLine(x: number, label: string, color: string, dash: number[]) {
  return { type: 'line' as const, label, data: [{ x, y: 0 }, { x, y: 1 }], borderColor: color, borderWidth: 2, borderDash: dash, pointRadius: 0, fill: false };
}

/** P(make) against layover, with its credible band, the target and the two layovers marked. */
export function makeCurveConfig(curve: ConnectionCurve, colors: ChartColors, intervalPercent: number): ChartConfiguration {
  const xs = curve.points.map((p) => p.layoverMinutes);
  const xMin = Math.min(...xs);
  const xMax = Math.max(...xs);
  const datasets: ChartConfiguration<'line'>['data']['datasets'] = [
    { label: `${intervalPercent}% credible band`, data: curve.points.map((p) => ({ x: p.layoverMinutes, y: p.hi })), borderWidth: 0, pointRadius: 0, backgroundColor: colors.band, fill: '+1' },
    { label: 'band lower edge', data: curve.points.map((p) => ({ x: p.layoverMinutes, y: p.lo })), borderWidth: 0, pointRadius: 0, fill: false },
    { label: 'P(make)', data: curve.points.map((p) => ({ x: p.layoverMinutes, y: p.p })), borderColor: colors.accent, borderWidth: 2.5, pointRadius: 0, fill: false },
    { label: `target ${Math.round(curve.targetProbability * 100)}%`, data: [{ x: xMin, y: curve.targetProbability }, { x: xMax, y: curve.targetProbability }], borderColor: colors.below, borderDash: [6, 4], borderWidth: 1.5, pointRadius: 0, fill: false },
    verticalLine(curve.layoverMinutes, `this layover ${curve.layoverMinutes} min`, colors.ink, []),
  ];
  if (curve.minLayoverMinutes !== null) datasets.push(verticalLine(curve.minLayoverMinutes, `minimum for target ${curve.minLayoverMinutes} min`, colors.meets, [2, 3]));
  return {
    type: 'line',
    data: { datasets },
    options: {
      ...common(colors),
      parsing: false,
      plugins: {
        legend: { labels: { color: colors.ink, boxWidth: 14, filter: (item) => item.text !== 'band lower edge' } },
        tooltip: { mode: 'nearest', intersect: false },
      },
      scales: {
        x: axis(colors, 'layover (minutes)', { type: 'linear', min: xMin, max: xMax }),
        y: axis(colors, 'P(make the connection)', { min: 0, max: 1, ticks: { color: colors.muted, callback: (v: number | string) => `${Math.round(Number(v) * 100)}%` } }),
      },
    },
  };
}

/** The predictive distribution of the margin, misses (margin < 0) and makes in two colours. */
export function marginConfig(curve: ConnectionCurve, colors: ChartColors): ChartConfiguration {
  const labels = curve.margin.map((b) => String(b.marginMinutes));
  return {
    type: 'bar',
    data: {
      labels,
      datasets: [
        { label: 'would miss (margin below 0)', data: curve.margin.map((b) => (b.marginMinutes < 0 ? b.probability : null)), backgroundColor: colors.below, stack: 'm', barPercentage: 1, categoryPercentage: 1 },
        { label: 'would make it', data: curve.margin.map((b) => (b.marginMinutes >= 0 ? b.probability : null)), backgroundColor: colors.meets, stack: 'm', barPercentage: 1, categoryPercentage: 1 },
      ],
    },
    options: {
      ...common(colors),
      scales: {
        x: axis(colors, `margin = layover − MCT − (arrival delay − departure delay), minutes (bars of ${curve.binMinutes})`, { stacked: true, ticks: { color: colors.muted, maxTicksLimit: 14 } }),
        y: axis(colors, 'probability', { stacked: true, beginAtZero: true, ticks: { color: colors.muted, callback: (v: number | string) => `${(Number(v) * 100).toFixed(1)}%` } }),
      },
    },
  };
}

/** Options of one trip: total travel time against P(on time), Pareto-optimal ones marked. */
export function optionsScatterConfig(options: readonly TripView[], colors: ChartColors): ChartConfiguration {
  const point = (t: TripView) => ({ x: t.totalTravelMinutes / 60, y: t.pOnTime ?? 0, label: t.option || '(no label)' });
  const front = options.filter((t) => t.paretoOptimal).map(point).sort((a, b) => a.x - b.x);
  return {
    type: 'scatter',
    data: {
      datasets: [
        { label: 'Pareto-optimal (not beaten on every count)', data: front, pointStyle: 'rectRot', pointRadius: 9, backgroundColor: colors.meets, borderColor: colors.ink, showLine: true, borderDash: [4, 4] },
        { label: 'beaten by another option', data: options.filter((t) => !t.paretoOptimal).map(point), pointStyle: 'circle', pointRadius: 7, backgroundColor: colors.muted, borderColor: colors.ink },
      ],
    },
    options: {
      ...common(colors),
      plugins: {
        legend: { labels: { color: colors.ink } },
        tooltip: { callbacks: { label: (item) => `${(item.raw as { label: string }).label}: ${(item.parsed.x ?? 0).toFixed(1)} h, ${Math.round((item.parsed.y ?? 0) * 100)}% on time` } },
      },
      scales: {
        x: axis(colors, 'total travel time (hours)', { type: 'linear', grace: '10%' }),
        y: axis(colors, 'P(on-time arrival)', { min: 0, max: 1, ticks: { color: colors.muted, callback: (v: number | string) => `${Math.round(Number(v) * 100)}%` } }),
      },
    },
  };
}

/** Bars up to the count where the remaining probability is negligible (at least 0…5). */
export function shownCounts(distribution: readonly number[]): number {
  let cumulative = 0;
  for (let k = 0; k < distribution.length; k++) {
    cumulative += distribution[k] ?? 0;
    if (cumulative >= 0.999 && k >= 5) return k + 1;
  }
  return distribution.length;
}

export function groupCountConfig(group: GroupView, colors: ChartColors): ChartConfiguration {
  const n = shownCounts(group.countDistribution);
  return {
    type: 'bar',
    data: {
      labels: group.countDistribution.slice(0, n).map((_, k) => String(k)),
      datasets: [{ label: 'P(exactly this many travelers misconnect)', data: group.countDistribution.slice(0, n), backgroundColor: group.countDistribution.slice(0, n).map((_, k) => (k === 0 ? colors.meets : colors.near)) }],
    },
    options: {
      ...common(colors),
      scales: {
        x: axis(colors, 'travelers who miss at least one connection'),
        y: axis(colors, 'probability', { beginAtZero: true, ticks: { color: colors.muted, callback: (v: number | string) => `${Math.round(Number(v) * 100)}%` } }),
      },
    },
  };
}

export interface TracePoint {
  readonly stage: string;
  readonly kind: string;
  readonly iteration: number;
  readonly objective: number;
}

/** The points of the fit now running (the last stage and kind in the trace). */
export function currentSegment(trace: readonly TracePoint[]): TracePoint[] {
  const last = trace[trace.length - 1];
  if (!last) return [];
  return trace.filter((p) => p.stage === last.stage && p.kind === last.kind);
}

/** The running fit's objective (log posterior) by iteration: it rises and levels off as the fit converges. */
export function objectiveTraceConfig(trace: readonly TracePoint[], title: string, colors: ChartColors): ChartConfiguration {
  const points = currentSegment(trace).map((p) => ({ x: p.iteration, y: p.objective }));
  return {
    type: 'line',
    data: { datasets: [{ label: title, data: points, borderColor: colors.accent, borderWidth: 2, pointRadius: 0, fill: false }] },
    options: {
      ...common(colors),
      parsing: false,
      scales: {
        x: axis(colors, 'iteration', { type: 'linear' }),
        y: axis(colors, 'log posterior (higher is better)', { type: 'linear' }),
      },
    },
  };
}

/** Predictive against held-out delay quantiles; points on the diagonal mean a well-calibrated fit. */
export function qqConfig(qq: readonly { probability: number; observedMinutes: number; predictedMinutes: number }[], label: string, colors: ChartColors): ChartConfiguration {
  const all = qq.flatMap((q) => [q.observedMinutes, q.predictedMinutes]);
  const lo = all.length ? Math.min(...all) : 0;
  const hi = all.length ? Math.max(...all) : 1;
  return {
    type: 'scatter',
    data: {
      datasets: [
        { label, data: qq.map((q) => ({ x: q.observedMinutes, y: q.predictedMinutes, p: q.probability })), pointRadius: 5, backgroundColor: colors.accent, borderColor: colors.ink },
        { type: 'line', label: 'perfect calibration', data: [{ x: lo, y: lo }, { x: hi, y: hi }], borderColor: colors.muted, borderDash: [5, 4], borderWidth: 1.5, pointRadius: 0, fill: false },
      ],
    },
    options: {
      ...common(colors),
      plugins: {
        legend: { labels: { color: colors.ink } },
        tooltip: { callbacks: { label: (item) => `${Math.round(((item.raw as { p?: number }).p ?? 0) * 1000) / 10}% quantile: held out ${Math.round(item.parsed.x ?? 0)} min, predicted ${Math.round(item.parsed.y ?? 0)} min` } },
      },
      scales: {
        x: axis(colors, 'held-out delay quantile (minutes)', { type: 'linear' }),
        y: axis(colors, 'predicted delay quantile (minutes)', { type: 'linear' }),
      },
    },
  };
}

export function readChartColors(root: Element): ChartColors {
  const css = getComputedStyle(root);
  const get = (name: string, fallback: string) => css.getPropertyValue(name).trim() || fallback;
  return {
    ink: get('--ink', '#1d2430'),
    muted: get('--muted', '#5d6675'),
    grid: get('--grid', 'rgba(0,0,0,0.08)'),
    meets: get('--meets', '#1f7a6d'),
    near: get('--near', '#c98a12'),
    below: get('--below', '#b3364f'),
    accent: get('--accent', '#2f5d8a'),
    band: get('--band', 'rgba(47,93,138,0.18)'),
  };
}
