import { render, screen, within } from '@testing-library/react';
import { scaleLinear, scalePoint } from 'd3';
import { describe, expect, it } from 'vitest';
import { TrendChart, trendChartSize, type TrendChartPoint } from './trend-chart.tsx';

// Invented monthly SDIs: a lab drifting high, one month without a peer comparison.
const sdis: TrendChartPoint[] = [
  { period: '2026-06', value: 0.4 },
  { period: '2026-07', value: 1.2 },
  { period: '2026-08', value: null },
  { period: '2026-09', value: 2.4 },
  { period: '2026-10', value: -0.3 },
  { period: '2026-11', value: 3.3 },
];

function translation(element: Element) {
  const match = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(
    element.parentElement?.getAttribute('transform') ?? '',
  );
  return { x: Number(match?.[1]), y: Number(match?.[2]) };
}

describe('TrendChart', () => {
  it('when SDIs are drawn, then each month sits at its SDI with the shape of its flag, and a month without one is left out', () => {
    render(<TrendChart points={sdis} measure="sdi" title="SDI, last 6 months" />);
    const { width, height, margin } = trendChartSize;
    // One slot per month, half a slot of padding at each end; ±4 SD (the ±3 guides always show).
    const x = scalePoint<string>()
      .domain(sdis.map((p) => p.period))
      .range([margin.left, width - margin.right])
      .padding(0.5);
    const y = scaleLinear()
      .domain([-4, 4])
      .range([height - margin.bottom, margin.top]);
    const figure = screen.getByTestId('trend-chart-sdi');
    const marks = figure.querySelectorAll('[data-period]');
    expect([...marks].map((m) => m.getAttribute('data-period'))).toEqual([
      '2026-06',
      '2026-07',
      '2026-09',
      '2026-10',
      '2026-11',
    ]);
    for (const mark of marks) {
      const point = sdis.find((p) => p.period === mark.getAttribute('data-period'))!;
      const at = translation(mark);
      expect(at.x).toBeCloseTo(x(point.period)!, 6);
      expect(at.y).toBeCloseTo(y(point.value!), 6);
    }
    // Flags by the thresholds of docs/methods.md §3 (|SDI| ≤ 1 fine, ≤ 2 acceptable, ≤ 3 warning, > 3 action).
    const severities = Object.fromEntries(
      [...marks].map((m) => [m.getAttribute('data-period'), m.getAttribute('data-severity')]),
    );
    expect(severities).toEqual({
      '2026-06': 'fine',
      '2026-07': 'acceptable',
      '2026-09': 'warning',
      '2026-10': 'fine',
      '2026-11': 'action',
    });
    // The warning and action guides at ±2 and ±3.
    for (const value of [2, -2, 3, -3]) {
      const guide = figure.querySelector(`[data-guide="${value}"]`)!;
      expect(Number(guide.getAttribute('y1'))).toBeCloseTo(y(value), 6);
    }
  });

  it('when the values are shown as a table, then every month is listed with its SDI and flag in words', () => {
    render(<TrendChart points={sdis} measure="sdi" title="SDI, last 6 months" />);
    const rows = within(screen.getByRole('table', { name: /values$/ }))
      .getAllByRole('row')
      .slice(1);
    expect(rows.map((row) => [...row.children].map((cell) => cell.textContent).slice(1))).toEqual([
      ['+0.40', 'Fine'],
      ['+1.20', 'Acceptable'],
      ['—', 'no figure'],
      ['+2.40', 'Warning'],
      ['\u22120.30', 'Fine'],
      ['+3.30', 'Action'],
    ]);
  });

  it('when CVRs are drawn, then the axis starts at 0 and the flags follow the CVR thresholds', () => {
    render(
      <TrendChart
        points={[
          { period: '2026-10', value: 0.9 },
          { period: '2026-11', value: 1.7 },
        ]}
        measure="cvr"
        title="CVR"
      />,
    );
    const figure = screen.getByTestId('trend-chart-cvr');
    const { height, margin } = trendChartSize;
    const y = scaleLinear()
      .domain([0, 2.5])
      .range([height - margin.bottom, margin.top]);
    const november = figure.querySelector('[data-period="2026-11"]')!;
    expect(translation(november).y).toBeCloseTo(y(1.7), 6);
    // CVR ≤ 1 fine, ≤ 1.5 acceptable, ≤ 2 warning (docs/methods.md §3).
    expect(november.getAttribute('data-severity')).toBe('warning');
    expect(figure.querySelector('[data-period="2026-10"]')!.getAttribute('data-severity')).toBe('fine');
  });
});
