// The parts of the lab's measurement uncertainty (Nordtest approach, docs/methods.md §3) as bars in %:
// within-lab reproducibility, the bias components, the combined and the expanded uncertainty.
import { scaleBand, scaleLinear } from 'd3';
import { AxisBottom } from './axis.tsx';
import { ChartFigure, ChartTable } from './chart-figure.tsx';
import { plotArea, type ChartSize } from './chart-layout.ts';
import { usePointNavigation } from './use-point-navigation.ts';

export type UncertaintyComponent = {
  key: string;
  /** e.g. "u(Rw), within-lab reproducibility" */
  label: string;
  valuePct: number;
  /** How it is obtained, for the table. */
  basis: string;
  /** The result rather than an input: drawn darker. */
  result?: boolean;
};

export const uncertaintyChartSize: ChartSize = {
  width: 620,
  height: 250,
  margin: { top: 8, right: 64, bottom: 40, left: 220 },
};

export function UncertaintyChart({
  components,
  title = 'Measurement uncertainty and its components',
  headingLevel,
}: {
  components: readonly UncertaintyComponent[];
  title?: string;
  headingLevel?: 2 | 3 | 4;
}) {
  const size = uncertaintyChartSize;
  const area = plotArea(size);
  const x = scaleLinear()
    .domain([0, Math.max(1, ...components.map((c) => c.valuePct)) * 1.05])
    .range(area.xRange)
    .nice();
  const y = scaleBand<string>()
    .domain(components.map((c) => c.key))
    .range([area.top, area.bottom])
    .padding(0.3);
  const navigation = usePointNavigation(components.length);
  const active = navigation.active !== null ? components[navigation.active] : null;
  const describe = (c: UncertaintyComponent) => `${c.label}: ${c.valuePct.toFixed(2)} %`;
  return (
    <ChartFigure
      title={title}
      headingLevel={headingLevel}
      size={size}
      testId="uncertainty-chart"
      description="Relative standard uncertainties in %: within-lab reproducibility from your long-term QC CV, bias from the peer comparisons, their combination, and the expanded uncertainty (k = 2, about 95 % coverage)."
      readout={active ? describe(active) : null}
      table={
        <ChartTable
          caption={`${title}: values`}
          headers={['Component', 'Value (%)', 'Obtained from']}
          rows={components.map((c) => ({
            key: c.key,
            emphasis: c.result,
            cells: [c.label, c.valuePct.toFixed(2), c.basis],
          }))}
        />
      }
    >
      <AxisBottom scale={x} y={area.bottom} tickCount={6} format={(v: number) => String(v)} label="%" />
      {components.map((component, index) => {
        const top = y(component.key) ?? 0;
        return (
          <g key={component.key}>
            <text
              aria-hidden="true"
              x={area.left - 8}
              y={top + y.bandwidth() / 2}
              dy="0.32em"
              textAnchor="end"
              className="text-[12px]"
              fill="var(--color-slate-800)"
            >
              {component.label}
            </text>
            <rect
              {...navigation.pointProps(index)}
              role="img"
              aria-label={describe(component)}
              data-value={component.valuePct}
              x={area.left}
              y={top}
              width={Math.max(1, x(component.valuePct) - area.left)}
              height={y.bandwidth()}
              rx={2}
              fill={component.result ? 'var(--color-plumb-700)' : 'var(--color-plumb-300)'}
              stroke={navigation.active === index ? 'var(--color-brass-500)' : 'none'}
              strokeWidth={2}
              className="cursor-pointer outline-none"
            />
            <text
              aria-hidden="true"
              x={x(component.valuePct) + 6}
              y={top + y.bandwidth() / 2}
              dy="0.32em"
              className="text-[12px] font-medium"
              fill="var(--color-slate-800)"
            >
              {component.valuePct.toFixed(2)} %
            </text>
          </g>
        );
      })}
    </ChartFigure>
  );
}
