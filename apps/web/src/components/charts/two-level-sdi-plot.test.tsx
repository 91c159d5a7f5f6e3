import { fireEvent, render, screen, within } from '@testing-library/react';
import { scaleLinear } from 'd3';
import { describe, expect, it } from 'vitest';
import { TwoLevelSdiPlot, twoLevelPlotSize, type TwoLevelPoint } from './two-level-sdi-plot.tsx';

// Invented SDIs of a peer group of six labs; ours reads high at both levels (a systematic error).
const points: TwoLevelPoint[] = [
  { key: 'a', x: -0.6, y: -0.2, isOwnLab: false },
  { key: 'b', x: 0.3, y: 0.5, isOwnLab: false },
  { key: 'c', x: -1.4, y: -0.9, isOwnLab: false },
  { key: 'own', x: 2.5, y: 1.8, isOwnLab: true },
  { key: 'd', x: 0.9, y: -0.4, isOwnLab: false },
  { key: 'e', x: -0.1, y: 0.2, isOwnLab: false },
];

/** The translate(x,y) of the group a marker is drawn in. */
function translation(element: Element): { x: number; y: number } {
  const match = /translate\(([-\d.e]+),([-\d.e]+)\)/.exec(
    element.parentElement?.getAttribute('transform') ?? '',
  );
  if (!match) throw new Error('the marker is not placed with a translate()');
  return { x: Number(match[1]), y: Number(match[2]) };
}

describe('TwoLevelSdiPlot', () => {
  it('when the SDIs lie within ±4, then our lab sits at its two SDIs on ±4 SD axes', () => {
    render(<TwoLevelSdiPlot points={points} xLevel={1} yLevel={2} />);
    // The expected position from the chart's published size: both axes run from −4 to +4 SD
    // (the ±3 guides must always show), inside the margins; SVG y grows downwards.
    const { width, height, margin } = twoLevelPlotSize;
    const x = scaleLinear()
      .domain([-4, 4])
      .range([margin.left, width - margin.right]);
    const y = scaleLinear()
      .domain([-4, 4])
      .range([height - margin.bottom, margin.top]);

    const own = screen.getByRole('img', { name: /^Your lab: SDI \+2\.50 at level 1, \+1\.80 at level 2$/ });
    const at = translation(own);
    expect(at.x).toBeCloseTo(x(2.5), 6);
    expect(at.y).toBeCloseTo(y(1.8), 6);
    expect(own.getAttribute('data-own-lab')).toBe('true');

    // Exactly one marked lab; the five others unnamed.
    const figure = screen.getByTestId('two-level-sdi-plot');
    expect(figure.querySelectorAll('[data-own-lab="true"]')).toHaveLength(1);
    expect(within(figure).getAllByRole('img', { name: /^Other lab \d: / })).toHaveLength(5);

    // The diagonal runs corner to corner, through (−4,−4) and (+4,+4).
    const diagonal = figure.querySelector('[data-role="diagonal"]')!;
    expect(Number(diagonal.getAttribute('x1'))).toBeCloseTo(x(-4), 6);
    expect(Number(diagonal.getAttribute('y1'))).toBeCloseTo(y(-4), 6);
    expect(Number(diagonal.getAttribute('x2'))).toBeCloseTo(x(4), 6);
    expect(Number(diagonal.getAttribute('y2'))).toBeCloseTo(y(4), 6);
  });

  it('when our lab lies beyond 4 SD, then the axes widen to the next whole SD and still place it', () => {
    render(
      <TwoLevelSdiPlot
        points={[...points.filter((p) => !p.isOwnLab), { key: 'own', x: 5.2, y: 4.9, isOwnLab: true }]}
        xLevel={1}
        yLevel={2}
      />,
    );
    const { width, height, margin } = twoLevelPlotSize;
    // 5.2 needs an axis to ±6 (the chart keeps a quarter SD of room before the next whole SD).
    const x = scaleLinear()
      .domain([-6, 6])
      .range([margin.left, width - margin.right]);
    const y = scaleLinear()
      .domain([-6, 6])
      .range([height - margin.bottom, margin.top]);
    const at = translation(screen.getByRole('img', { name: /^Your lab:/ }));
    expect(at.x).toBeCloseTo(x(5.2), 6);
    expect(at.y).toBeCloseTo(y(4.9), 6);
  });

  it('when the values are shown as a table, then it lists the same SDIs, our lab named and the others numbered', () => {
    render(<TwoLevelSdiPlot points={points} xLevel={1} yLevel={2} />);
    const table = screen.getByRole('table', { name: /values$/ });
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(points.length);
    const own = rows.find((row) => within(row).queryByText('Your lab'))!;
    expect(within(own).getByText('+2.50')).toBeTruthy();
    expect(within(own).getByText('+1.80')).toBeTruthy();
    // Every SDI of the data appears in the table, with a true minus sign for negatives.
    const cells = rows.flatMap((row) =>
      within(row)
        .getAllByRole('cell')
        .map((cell) => cell.textContent),
    );
    for (const point of points) {
      expect(cells).toContain(
        `${point.x > 0 ? '+' : point.x < 0 ? '\u2212' : ''}${Math.abs(point.x).toFixed(2)}`,
      );
      expect(cells).toContain(
        `${point.y > 0 ? '+' : point.y < 0 ? '\u2212' : ''}${Math.abs(point.y).toFixed(2)}`,
      );
    }
  });

  it('when a point has focus, then the arrow keys move along the points and the chart reads the point out', () => {
    render(<TwoLevelSdiPlot points={points} xLevel={1} yLevel={2} />);
    const markers = screen.getAllByRole('img', { name: /SDI/ });
    // One tab stop into the points.
    expect(markers.filter((m) => m.getAttribute('tabindex') === '0')).toHaveLength(1);
    const first = markers.find((m) => m.getAttribute('tabindex') === '0')!;
    first.focus();
    fireEvent.keyDown(first, { key: 'End' });
    expect(document.activeElement?.getAttribute('aria-label')).toMatch(/^Your lab/);
    expect(screen.getByText(/^Your lab: SDI \+2\.50 at level 1/, { selector: 'p' })).toBeTruthy();
  });
});
