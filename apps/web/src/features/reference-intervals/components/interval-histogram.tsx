import { scaleLinear } from 'd3';
import type { PartitionResult } from '@plumbline/contracts';

const WIDTH = 640;
const HEIGHT = 240;
const M = { top: 12, right: 16, bottom: 36, left: 44 };

/** Histogram of a partition's values with the limits (solid) and their 90 % CIs (shaded bands). */
export function IntervalHistogram({ partition, unit }: { partition: PartitionResult; unit: string }) {
  const bins = partition.histogram;
  if (bins.length === 0) return <p className="text-sm text-slate-600">No values in this partition.</p>;
  const limits = [partition.lower, partition.upper].filter((l) => l !== null);
  const lo = Math.min(bins[0].from, ...limits.map((l) => l.ci?.[0] ?? l.value));
  const hi = Math.max(bins[bins.length - 1].to, ...limits.map((l) => l.ci?.[1] ?? l.value));
  const x = scaleLinear()
    .domain([lo, hi])
    .range([M.left, WIDTH - M.right])
    .nice();
  const y = scaleLinear()
    .domain([0, Math.max(...bins.map((b) => b.count))])
    .range([HEIGHT - M.bottom, M.top])
    .nice();
  const describe = limits.length
    ? `limits ${partition.lower?.value.toFixed(2)} and ${partition.upper?.value.toFixed(2)} ${unit}`
    : 'no limits';
  return (
    <svg
      viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
      className="w-full max-w-2xl"
      role="img"
      aria-label={`Histogram of ${partition.n} values of ${partition.label}, ${describe}`}
      data-testid="interval-histogram"
    >
      {limits.map((l, i) =>
        l.ci ? (
          <rect
            key={`ci-${i}`}
            x={x(l.ci[0])}
            width={Math.max(1, x(l.ci[1]) - x(l.ci[0]))}
            y={M.top}
            height={HEIGHT - M.bottom - M.top}
            className="fill-brass-200/70"
          />
        ) : null,
      )}
      {bins.map((b, i) => (
        <rect
          key={i}
          x={x(b.from)}
          width={Math.max(0.5, x(b.to) - x(b.from) - 0.5)}
          y={y(b.count)}
          height={HEIGHT - M.bottom - y(b.count)}
          className="fill-plumb-600"
        />
      ))}
      {limits.map((l, i) => (
        <line
          key={`limit-${i}`}
          x1={x(l.value)}
          x2={x(l.value)}
          y1={M.top}
          y2={HEIGHT - M.bottom}
          className="stroke-alarm-700"
          strokeWidth={2}
        />
      ))}
      <line
        x1={M.left}
        x2={WIDTH - M.right}
        y1={HEIGHT - M.bottom}
        y2={HEIGHT - M.bottom}
        className="stroke-slate-400"
      />
      {x.ticks(8).map((t) => (
        <text
          key={t}
          x={x(t)}
          y={HEIGHT - M.bottom + 16}
          textAnchor="middle"
          className="fill-slate-700 text-[11px]"
        >
          {t}
        </text>
      ))}
      <text
        x={(WIDTH + M.left) / 2}
        y={HEIGHT - 4}
        textAnchor="middle"
        className="fill-slate-700 text-[11px]"
      >
        {unit}
      </text>
      {y.ticks(4).map((t) => (
        <text key={t} x={M.left - 6} y={y(t) + 4} textAnchor="end" className="fill-slate-700 text-[11px]">
          {t}
        </text>
      ))}
    </svg>
  );
}
