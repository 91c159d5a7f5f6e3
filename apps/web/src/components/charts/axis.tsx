// Axes drawn as JSX from a d3 scale's ticks (d3 computes, React renders), so every label is plain text
// in the SVG and the axes need no DOM mutation.

type TickScale = ((value: never) => number | undefined) & {
  ticks?: (count?: number) => unknown[];
  domain: () => unknown[];
  bandwidth?: () => number;
};

function tickValues<T>(scale: TickScale, count: number | undefined, values: readonly T[] | undefined): T[] {
  if (values) return [...values];
  return (scale.ticks ? scale.ticks(count) : scale.domain()) as T[];
}

function position(scale: TickScale, value: unknown): number {
  const offset = scale.bandwidth ? scale.bandwidth() / 2 : 0;
  return ((scale as unknown as (v: unknown) => number)(value) ?? 0) + offset;
}

export function AxisBottom<T>({
  scale,
  y,
  tickCount,
  tickValues: values,
  format = (v) => String(v),
  label,
  labelY = 34,
  xCenter,
}: {
  scale: TickScale;
  /** Where the axis line sits (the bottom of the plot area). */
  y: number;
  tickCount?: number;
  tickValues?: readonly T[];
  format?: (value: T) => string;
  label?: string;
  labelY?: number;
  xCenter?: number;
}) {
  const ticks = tickValues<T>(scale, tickCount, values);
  const range = (scale as unknown as { range: () => number[] }).range();
  return (
    <g aria-hidden="true" className="text-[12px]" fill="var(--color-slate-600)">
      <line x1={range[0]} x2={range[range.length - 1]} y1={y} y2={y} stroke="var(--color-slate-400)" />
      {ticks.map((tick) => {
        const x = position(scale, tick);
        return (
          <g key={String(tick)} transform={`translate(${x},${y})`}>
            <line y2={5} stroke="var(--color-slate-400)" />
            <text y={17} textAnchor="middle">
              {format(tick)}
            </text>
          </g>
        );
      })}
      {label ? (
        <text
          x={xCenter ?? (range[0] + range[range.length - 1]) / 2}
          y={y + labelY}
          textAnchor="middle"
          fill="var(--color-slate-700)"
          className="text-[13px] font-medium"
        >
          {label}
        </text>
      ) : null}
    </g>
  );
}

export function AxisLeft<T>({
  scale,
  x,
  tickCount,
  tickValues: values,
  format = (v) => String(v),
  label,
  gridTo,
}: {
  scale: TickScale;
  /** Where the axis line sits (the left of the plot area). */
  x: number;
  tickCount?: number;
  tickValues?: readonly T[];
  format?: (value: T) => string;
  label?: string;
  /** Draw faint grid lines across the plot, to this x. */
  gridTo?: number;
}) {
  const ticks = tickValues<T>(scale, tickCount, values);
  const range = (scale as unknown as { range: () => number[] }).range();
  const middle = (range[0] + range[range.length - 1]) / 2;
  return (
    <g aria-hidden="true" className="text-[12px]" fill="var(--color-slate-600)">
      <line x1={x} x2={x} y1={range[0]} y2={range[range.length - 1]} stroke="var(--color-slate-400)" />
      {ticks.map((tick) => {
        const y = position(scale, tick);
        return (
          <g key={String(tick)} transform={`translate(${x},${y})`}>
            {gridTo !== undefined ? <line x2={gridTo - x} stroke="var(--color-slate-200)" /> : null}
            <line x2={-5} stroke="var(--color-slate-400)" />
            <text x={-8} dy="0.32em" textAnchor="end">
              {format(tick)}
            </text>
          </g>
        );
      })}
      {label ? (
        <text
          transform={`translate(${x - 42},${middle}) rotate(-90)`}
          textAnchor="middle"
          fill="var(--color-slate-700)"
          className="text-[13px] font-medium"
        >
          {label}
        </text>
      ) : null}
    </g>
  );
}
