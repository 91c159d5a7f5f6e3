import { render, screen, within } from '@testing-library/react';
import { scaleLinear } from 'd3';
import { describe, expect, it } from 'vitest';
import {
  PeerDistributionChart,
  peerDistributionSize,
  stackRows,
  type LabMeanPoint,
} from './peer-distribution-chart.tsx';

// Invented potassium level-1 lab means of a peer group; ours reads high; one lab was left out.
const points: LabMeanPoint[] = [
  { key: 'a', mean: 4.11, isOwnLab: false },
  { key: 'b', mean: 4.14, isOwnLab: false },
  { key: 'c', mean: 4.15, isOwnLab: false },
  { key: 'd', mean: 4.18, isOwnLab: false },
  { key: 'own', mean: 4.42, isOwnLab: true },
  { key: 'e', mean: 3.7, isOwnLab: false, excluded: true },
];
const peer = { mean: 4.15, sd: 0.06 };

describe('PeerDistributionChart', () => {
  it('when drawn, then our lab sits at its mean on the value axis and is the only marked lab', () => {
    render(<PeerDistributionChart points={points} peer={peer} unit="mmol/L" decimals={2} />);
    const { width, margin } = peerDistributionSize;
    // The axis covers every lab mean and the peer mean ± 3.5 SD, 3 % padding, rounded to nice ticks.
    const low = Math.min(3.7, peer.mean - 3.5 * peer.sd);
    const high = Math.max(4.42, peer.mean + 3.5 * peer.sd);
    const pad = (high - low) * 0.03;
    const x = scaleLinear()
      .domain([low - pad, high + pad])
      .range([margin.left, width - margin.right])
      .nice();
    const own = screen.getByRole('img', {
      name: /^Your lab: mean 4\.420 mmol\/L, \+4\.50 SD from the peer mean$/,
    });
    const match = /translate\(([-\d.e]+),/.exec(own.parentElement!.getAttribute('transform')!);
    expect(Number(match![1])).toBeCloseTo(x(4.42), 6);
    expect(screen.getByTestId('peer-distribution').querySelectorAll('[data-own-lab="true"]')).toHaveLength(1);
    expect(
      screen.getByRole('img', {
        name: /^Other lab 1: mean 3\.700 mmol\/L, −7\.50 SD from the peer mean, left out of the peer figures$/,
      }),
    ).toBeTruthy();
  });

  it('when the values are shown as a table, then every lab mean is listed, ours named and the others numbered', () => {
    render(<PeerDistributionChart points={points} peer={peer} unit="mmol/L" decimals={2} />);
    const rows = within(screen.getByRole('table', { name: /values$/ }))
      .getAllByRole('row')
      .slice(1);
    expect(rows.map((row) => [...row.children].map((cell) => cell.textContent))).toEqual([
      ['Other lab 1', '3.700', '\u22127.50', 'no, left out'],
      ['Other lab 2', '4.110', '\u22120.67', 'yes'],
      ['Other lab 3', '4.140', '\u22120.17', 'yes'],
      ['Other lab 4', '4.150', '0.00', 'yes'],
      ['Other lab 5', '4.180', '+0.50', 'yes'],
      ['Your lab', '4.420', '+4.50', 'yes'],
    ]);
  });

  it('when dots would overlap, then they stack in rows; dots a diameter apart share the bottom row', () => {
    const rows = stackRows(
      [
        { key: 'a', x: 100 },
        { key: 'b', x: 105 },
        { key: 'c', x: 108 },
        { key: 'd', x: 112 },
      ],
      12,
    );
    expect(Object.fromEntries(rows)).toEqual({ a: 0, b: 1, c: 2, d: 0 });
  });
});
