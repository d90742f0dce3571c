// Inline SVG charts for reports: P(make) per connection against the target, and the
// comparison of a trip's options. Plain strings, so they print, save and open anywhere.
//
// Risk is carried by position, shape and words as well as colour (a hollow diamond and the
// word "below" for connections under the target), so the charts survive greyscale printing
// and colour-blind readers.
import { formatPercent } from './format';
import { escapeHtml } from './html';

export interface ProbabilityRow {
  readonly label: string;
  /** Point estimate in [0, 1]. */
  readonly p: number;
  /** 90% credible interval of the probability. */
  readonly lo: number;
  readonly hi: number;
}

export interface OptionBar {
  readonly label: string;
  /** Chance of arriving on time (by the deadline, or with every connection made). */
  readonly pOnTime: number;
  readonly detail: string;
  readonly paretoOptimal: boolean;
}

const FONT = 'font-family="Helvetica, Arial, sans-serif"';
const ROW_HEIGHT = 20;
const LABEL_WIDTH = 270;
const PLOT_WIDTH = 330;
const RIGHT_WIDTH = 80;
const TOP = 26;
const BOTTOM = 30;

function fmt(n: number): string {
  return (Math.round(n * 10) / 10).toString();
}

/** The x range of a probability axis: always ends at 100%, starts low enough to show every interval. */
function axisStart(values: readonly number[], target: number): number {
  const lowest = Math.min(target, ...values);
  if (lowest >= 0.5) return 0.5;
  return Math.max(0, Math.floor(lowest * 10) / 10);
}

function axisTicks(start: number): number[] {
  const step = 1 - start > 0.5 ? 0.2 : 0.1;
  const ticks: number[] = [];
  for (let t = 1; t >= start - 1e-9; t -= step) ticks.push(Math.round(t * 100) / 100);
  return ticks.reverse();
}

function truncate(label: string, max: number): string {
  return label.length <= max ? label : label.slice(0, max - 1) + '…';
}

/**
 * P(make) per connection as points with their 90% intervals, and the target as a dashed line.
 *
 * `title` becomes the SVG's accessible name. Rows keep their order; callers sort them.
 */
export function probabilityChartSvg(rows: readonly ProbabilityRow[], target: number, title: string): string {
  const start = axisStart(
    rows.flatMap((r) => [r.lo, r.p]),
    target,
  );
  const x = (p: number) => LABEL_WIDTH + ((Math.min(1, Math.max(start, p)) - start) / (1 - start)) * PLOT_WIDTH;
  const width = LABEL_WIDTH + PLOT_WIDTH + RIGHT_WIDTH;
  const height = TOP + rows.length * ROW_HEIGHT + BOTTOM;
  const plotBottom = TOP + rows.length * ROW_HEIGHT;
  const parts: string[] = [];
  parts.push(
    `<svg xmlns="http://www.w3.org/2000/svg" role="img" aria-label="${escapeHtml(title)}" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" class="chart">`,
    `<title>${escapeHtml(title)}</title>`,
  );
  for (const t of axisTicks(start)) {
    parts.push(
      `<line x1="${fmt(x(t))}" y1="${TOP - 4}" x2="${fmt(x(t))}" y2="${plotBottom}" stroke="#d9dde3" stroke-width="1"/>`,
      `<text x="${fmt(x(t))}" y="${plotBottom + 14}" text-anchor="middle" font-size="10" fill="#444" ${FONT}>${formatPercent(t)}</text>`,
    );
  }
  parts.push(
    `<text x="${LABEL_WIDTH + PLOT_WIDTH / 2}" y="${plotBottom + 27}" text-anchor="middle" font-size="10" fill="#444" ${FONT}>chance of making the connection (bar: 90% credible interval)</text>`,
  );
  rows.forEach((row, i) => {
    const cy = TOP + i * ROW_HEIGHT + ROW_HEIGHT / 2;
    const below = row.p < target;
    if (i % 2 === 1) parts.push(`<rect x="0" y="${cy - ROW_HEIGHT / 2}" width="${width}" height="${ROW_HEIGHT}" fill="#f4f6f8"/>`);
    parts.push(
      `<text x="${LABEL_WIDTH - 8}" y="${cy + 4}" text-anchor="end" font-size="11" fill="#1b1f24" ${FONT}>${escapeHtml(truncate(row.label, 46))}</text>`,
      `<line x1="${fmt(x(row.lo))}" y1="${cy}" x2="${fmt(x(row.hi))}" y2="${cy}" stroke="#5b6675" stroke-width="2"/>`,
    );
    if (below) {
      const px = x(row.p);
      parts.push(
        `<path d="M ${fmt(px)} ${cy - 6} L ${fmt(px + 6)} ${cy} L ${fmt(px)} ${cy + 6} L ${fmt(px - 6)} ${cy} Z" fill="#ffffff" stroke="#b3361d" stroke-width="2"/>`,
      );
    } else {
      parts.push(`<circle cx="${fmt(x(row.p))}" cy="${cy}" r="5" fill="#2f6b8f"/>`);
    }
    parts.push(
      `<text x="${LABEL_WIDTH + PLOT_WIDTH + 8}" y="${cy + 4}" font-size="11" fill="${below ? '#b3361d' : '#1b1f24'}" ${FONT}>${formatPercent(row.p)}${below ? ' below' : ''}</text>`,
    );
  });
  parts.push(
    `<line x1="${fmt(x(target))}" y1="${TOP - 6}" x2="${fmt(x(target))}" y2="${plotBottom}" stroke="#1b1f24" stroke-width="1.5" stroke-dasharray="5 3"/>`,
    `<text x="${fmt(x(target))}" y="${TOP - 10}" text-anchor="middle" font-size="10" fill="#1b1f24" ${FONT}>target ${formatPercent(target)}</text>`,
    '</svg>',
  );
  return parts.join('');
}

/**
 * A trip's options as horizontal bars of their on-time chance, with the options no other
 * option beats on every measure flagged in words.
 *
 * No target line: the target is for single connections, and on time is a different measure.
 */
export function optionChartSvg(options: readonly OptionBar[], title: string): string {
  const labelWidth = 90;
  const plotWidth = 300;
  const rightWidth = 290;
  const rowHeight = 32;
  const top = 8;
  const width = labelWidth + plotWidth + rightWidth;
  const height = top + options.length * rowHeight + 22;
  const x = (p: number) => labelWidth + Math.min(1, Math.max(0, p)) * plotWidth;
  const parts: string[] = [
    `<svg xmlns="http://www.w3.org/2000/svg" role="img" aria-label="${escapeHtml(title)}" viewBox="0 0 ${width} ${height}" width="${width}" height="${height}" class="chart">`,
    `<title>${escapeHtml(title)}</title>`,
  ];
  const plotBottom = top + options.length * rowHeight;
  for (const t of [0, 0.25, 0.5, 0.75, 1]) {
    parts.push(
      `<line x1="${fmt(x(t))}" y1="${top}" x2="${fmt(x(t))}" y2="${plotBottom}" stroke="#d9dde3" stroke-width="1"/>`,
      `<text x="${fmt(x(t))}" y="${plotBottom + 14}" text-anchor="middle" font-size="10" fill="#444" ${FONT}>${formatPercent(t)}</text>`,
    );
  }
  options.forEach((o, i) => {
    const y = top + i * rowHeight;
    parts.push(
      `<text x="${labelWidth - 8}" y="${y + 15}" text-anchor="end" font-size="11" fill="#1b1f24" ${FONT}>${escapeHtml(truncate(o.label, 14))}</text>`,
      `<rect x="${labelWidth}" y="${y + 4}" width="${fmt(x(o.pOnTime) - labelWidth)}" height="16" fill="${o.paretoOptimal ? '#2f6b8f' : '#9aa6b2'}"/>`,
      `<text x="${labelWidth + plotWidth + 8}" y="${y + 12}" font-size="11" fill="#1b1f24" ${FONT}>${formatPercent(o.pOnTime)} on time${o.paretoOptimal ? ' · not beaten' : ''}</text>`,
      `<text x="${labelWidth + plotWidth + 8}" y="${y + 25}" font-size="9.5" fill="#444" ${FONT}>${escapeHtml(truncate(o.detail, 58))}</text>`,
    );
  });
  parts.push('</svg>');
  return parts.join('');
}
