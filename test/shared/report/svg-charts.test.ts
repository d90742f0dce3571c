import { describe, expect, it } from 'vitest';
import { optionChartSvg, probabilityChartSvg } from '../../../shared/report/svg-charts';

function circlesX(svg: string): number[] {
  return [...svg.matchAll(/<circle cx="([\d.]+)"/g)].map((m) => Number(m[1]));
}

describe('probabilityChartSvg', () => {
  const rows = [
    { label: 'ORD A → B', p: 0.78, lo: 0.69, hi: 0.86 },
    { label: 'LHR C → D', p: 0.93, lo: 0.88, hi: 0.96 },
    { label: 'JFK E → F', p: 0.99, lo: 0.97, hi: 1 },
  ];
  const svg = probabilityChartSvg(rows, 0.9, 'P(make) per connection');

  it('marks a connection below the target by shape and word, not colour alone', () => {
    expect(svg.match(/<path d="M /g)).toHaveLength(1);
    expect(svg).toContain('78% below');
    expect(svg.match(/<circle /g)).toHaveLength(2);
  });

  it('places points left to right in order of their probability', () => {
    const [a, b] = circlesX(svg);
    expect(a).toBeLessThan(b as number);
  });

  it('draws the target line with its label, and grows one row per connection', () => {
    expect(svg).toContain('target 90%');
    expect(svg).toMatch(/stroke-dasharray="5 3"/);
    const height = (s: string) => Number(/height="(\d+)"/.exec(s)?.[1]);
    expect(height(probabilityChartSvg([...rows, ...rows], 0.9, 't')) - height(svg)).toBe(3 * 20);
  });

  it('escapes labels', () => {
    expect(probabilityChartSvg([{ label: '<b>&', p: 0.5, lo: 0.4, hi: 0.6 }], 0.9, 'x')).toContain('&lt;b&gt;&amp;');
  });
});

describe('optionChartSvg', () => {
  it('draws one bar per option, proportional to its on-time chance, and names the options not beaten', () => {
    const svg = optionChartSvg(
      [
        { label: 'Option A', pOnTime: 0.8, detail: 'x', paretoOptimal: true },
        { label: 'Option B', pOnTime: 0.4, detail: 'y', paretoOptimal: false },
      ],
      'options',
    );
    const widths = [...svg.matchAll(/<rect x="\d+" y="[\d.]+" width="([\d.]+)"/g)].map((m) => Number(m[1]));
    expect(widths).toEqual([240, 120]);
    expect(svg).toContain('80% on time · not beaten');
    expect(svg).toContain('40% on time</text>');
  });
});
