import { render, screen, within } from '@testing-library/react';
import { scaleLinear, scaleTime } from 'd3';
import { describe, expect, it } from 'vitest';
import { LeveyJenningsChart, leveyJenningsSize, type ControlChartPoint } from './levey-jennings-chart.tsx';

// Invented potassium level-1 values, one run a day in November 2026, around a target of
// 4.20 ± 0.10 mmol/L; on day 12 the value is 4.58 (+3.8 SD), which breaks 1-3s (and 1-2s).
const target = { mean: 4.2, sd: 0.1 };
const offsets = [
  0.3, -0.5, 0.8, -0.2, 0.1, -0.9, 0.4, 0.6, -0.3, 0.2, -0.6, 3.8, -0.4, 0.5, -0.1, 0.7, -0.8, 0.2, 1.1, -0.5,
];
const points: ControlChartPoint[] = offsets.map((z, index) => {
  const day = index + 1;
  return {
    key: `run-${day}`,
    at: `2026-11-${String(day).padStart(2, '0')}T08:00:00.000Z`,
    value: Number((target.mean + z * target.sd).toFixed(2)),
    run: `R${day}`,
    rules: day === 12 ? ['1-2s', '1-3s'] : [],
  };
});

function translation(element: Element): { x: number; y: number } {
  const group = element.closest('[data-point-key]');
  const match = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(group?.getAttribute('transform') ?? '');
  if (!match) throw new Error('the point is not placed with a translate()');
  return { x: Number(match[1]), y: Number(match[2]) };
}

describe('LeveyJenningsChart', () => {
  it('when a value breaks 1-3s, then that point, and only that one, is marked and labelled with the rule', () => {
    render(
      <LeveyJenningsChart
        points={points}
        target={target}
        targetLabel="your lab's established figures"
        unit="mmol/L"
        decimals={2}
        level={1}
      />,
    );
    const figure = screen.getByTestId('levey-jennings-level-1');
    const marked = figure.querySelectorAll('[data-rules]:not([data-rules=""])');
    expect(marked).toHaveLength(1);
    const point = marked[0];
    expect(point.getAttribute('data-rules')).toBe('1-2s 1-3s');
    expect(point.closest('[data-point-key]')?.getAttribute('data-point-key')).toBe('run-12');
    expect(point.getAttribute('aria-label')).toMatch(
      /run R12: 4\.580 mmol\/L, \+3\.80 SD, rejection: 1-2s, 1-3s$/,
    );

    // The label with the rejection rule's name sits in the same group as the point (its 1-2s warning
    // goes without saying and is listed in the point's description and the table).
    const label = point.closest('[data-point-key]')!.querySelector('[data-rule-label]');
    expect(label?.textContent).toBe('1-3s');

    // And the point is drawn where the value is: its date across, its value up. The axis spans the
    // target ± 4 SD, widened to the furthest value plus 0.3 SD (3.8 + 0.3 = 4.1 SD here), and the
    // dates from half a day before the first value to half a day after the last.
    const { width, height, margin } = leveyJenningsSize;
    const y = scaleLinear()
      .domain([target.mean - 4.1 * target.sd, target.mean + 4.1 * target.sd])
      .range([height - margin.bottom, margin.top]);
    const x = scaleTime()
      .domain([new Date('2026-10-31T20:00:00.000Z'), new Date('2026-11-20T20:00:00.000Z')])
      .range([margin.left, width - margin.right]);
    const at = translation(point);
    expect(at.x).toBeCloseTo(x(new Date('2026-11-12T08:00:00.000Z')), 6);
    expect(at.y).toBeCloseTo(y(4.58), 6);
  });

  it('when drawn, then the mean and the ±1, ±2, ±3 SD lines sit at the target figures', () => {
    render(
      <LeveyJenningsChart
        points={points}
        target={target}
        targetLabel="the peer group's figures"
        unit="mmol/L"
        decimals={2}
        level={1}
      />,
    );
    const { height, margin } = leveyJenningsSize;
    const y = scaleLinear()
      .domain([target.mean - 4.1 * target.sd, target.mean + 4.1 * target.sd])
      .range([height - margin.bottom, margin.top]);
    const figure = screen.getByTestId('levey-jennings-level-1');
    for (const k of [-3, -2, -1, 0, 1, 2, 3]) {
      const guide = figure.querySelector(`[data-sd-line="${k}"]`)!;
      expect(Number(guide.getAttribute('y1'))).toBeCloseTo(y(target.mean + k * target.sd), 6);
    }
    expect(
      within(figure).getByText(/against the peer group's figures \(mean 4\.200, SD 0\.100\)/, {
        selector: 'p',
      }),
    ).toBeTruthy();
  });

  it('when the values are shown as a table, then it lists every value with its SD from target and the rules broken', () => {
    render(
      <LeveyJenningsChart
        points={points}
        target={target}
        targetLabel="your lab's established figures"
        unit="mmol/L"
        decimals={2}
        level={1}
      />,
    );
    const table = screen.getByRole('table', { name: /values$/ });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(points.length);
    const flagged = rows.filter((row) => within(row).queryByText('1-2s, 1-3s'));
    expect(flagged).toHaveLength(1);
    expect(within(flagged[0]).getByText('R12')).toBeTruthy();
    expect(within(flagged[0]).getByText('4.580')).toBeTruthy();
    expect(within(flagged[0]).getByText('+3.80')).toBeTruthy();
    for (const [index, point] of points.entries()) {
      expect(within(rows[index]).getByText(point.value.toFixed(3))).toBeTruthy();
    }
  });

  it('when events are recorded, then those within the chart’s days are marked on the time axis, and others are not', () => {
    render(
      <LeveyJenningsChart
        points={points}
        target={target}
        targetLabel="your lab's established figures"
        unit="mmol/L"
        decimals={2}
        level={1}
        events={[
          { day: '2026-11-10', label: 'Reagent lot change on 2026-11-10' },
          { day: '2026-09-01', label: 'Maintenance on 2026-09-01' },
        ]}
      />,
    );
    const marks = screen.getByTestId('levey-jennings-level-1').querySelectorAll('[data-mark="event"]');
    expect([...marks].map((m) => m.getAttribute('data-day'))).toEqual(['2026-11-10']);
  });
});
