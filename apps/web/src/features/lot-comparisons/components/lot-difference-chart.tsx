// Per-lab differences (new lot − old lot) as dots on a horizontal axis, with the paired 95 % interval
// of the common shift as a bar and zero marked: a lot effect is a cloud and interval away from zero.
import { scaleLinear } from 'd3';
import type { LotComparison } from '@plumbline/contracts';

const WIDTH = 420;
const HEIGHT = 90;
const MARGIN = { left: 16, right: 16 };

export function LotDifferenceChart({ comparison, unit }: { comparison: LotComparison; unit: string }) {
  const interval = comparison.paired ?? comparison.welch;
  const values = [0, ...comparison.labDifferences, ...(interval ? [interval.low, interval.high] : [])];
  const extent = Math.max(...values.map(Math.abs)) || 1;
  const x = scaleLinear()
    .domain([-extent * 1.1, extent * 1.1])
    .range([MARGIN.left, WIDTH - MARGIN.right])
    .nice();
  return (
    <svg
      viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
      className="w-full max-w-md"
      role="img"
      aria-label={`Per-lab differences, level ${comparison.level}, in ${unit}`}
      data-testid={`lot-chart-${comparison.level}`}
    >
      <line x1={x(0)} x2={x(0)} y1={8} y2={62} stroke="var(--color-slate-400)" strokeDasharray="3 3" />
      {comparison.labDifferences.map((d, i) => (
        <circle key={i} cx={x(d)} cy={24 + (i % 3) * 6} r={3.5} fill="var(--color-plumb-700)" opacity={0.8}>
          <title>{d.toFixed(3)}</title>
        </circle>
      ))}
      {interval ? (
        <g data-testid={`lot-interval-${comparison.level}`}>
          <line
            x1={x(interval.low)}
            x2={x(interval.high)}
            y1={52}
            y2={52}
            stroke="var(--color-brass-500)"
            strokeWidth={3}
          />
          <circle cx={x(interval.difference)} cy={52} r={4} fill="var(--color-brass-500)" />
        </g>
      ) : null}
      {x.ticks(5).map((t) => (
        <text key={t} x={x(t)} y={80} fontSize={10} textAnchor="middle" fill="var(--color-slate-600)">
          {t}
        </text>
      ))}
    </svg>
  );
}
