// A figure of the lab's standing month by month: SDI (with its ±2 and ±3 guides) or CVR (with its
// 1, 1.5 and 2 guides). Each month's point has the shape and colour of its flag; months without a
// figure leave a gap in the line.
import { line, scalePoint, scaleLinear } from 'd3';
import {
  classifyCvr,
  classifySdi,
  DEFAULT_CVR_THRESHOLDS,
  DEFAULT_SDI_THRESHOLDS,
  type FlagThresholds,
} from '@plumbline/stats';
import { formatPeriod } from '../../utils/format.ts';
import { AxisBottom, AxisLeft } from './axis.tsx';
import { ChartFigure, ChartTable, LineSwatch, MarkerSwatch } from './chart-figure.tsx';
import { formatSigned, plotArea, symmetricSdiLimit, type ChartSize } from './chart-layout.ts';
import { markerPath, severityLabels, severityStyles, type Severity } from './severity.tsx';
import { usePointNavigation } from './use-point-navigation.ts';

export type TrendChartPoint = {
  /** 'YYYY-MM' */
  period: string;
  value: number | null;
};

export type TrendMeasure = 'sdi' | 'cvr';

export const trendChartSize: ChartSize = {
  width: 560,
  height: 250,
  margin: { top: 14, right: 16, bottom: 44, left: 54 },
};

/** Short month label for the axis: "Nov 26". */
function shortPeriod(period: string): string {
  const match = /^(\d{4})-(\d{2})$/.exec(period);
  if (!match) return period;
  const date = new Date(Date.UTC(Number(match[1]), Number(match[2]) - 1, 1));
  return new Intl.DateTimeFormat(undefined, { month: 'short', year: '2-digit', timeZone: 'UTC' }).format(
    date,
  );
}

export function trendScales(
  points: readonly TrendChartPoint[],
  measure: TrendMeasure,
  size: ChartSize = trendChartSize,
) {
  const area = plotArea(size);
  const x = scalePoint<string>()
    .domain(points.map((p) => p.period))
    .range(area.xRange)
    .padding(0.5);
  const values = points.map((p) => p.value);
  const domain: [number, number] =
    measure === 'sdi'
      ? [-symmetricSdiLimit(values), symmetricSdiLimit(values)]
      : [
          0,
          Math.max(
            2.5,
            Math.ceil(Math.max(0, ...values.filter((v): v is number => v !== null)) * 2 + 0.5) / 2,
          ),
        ];
  const y = scaleLinear().domain(domain).range(area.yRange);
  return { x, y };
}

export function TrendChart({
  points,
  measure,
  title,
  headingLevel,
  thresholds = measure === 'sdi' ? DEFAULT_SDI_THRESHOLDS : DEFAULT_CVR_THRESHOLDS,
  marks = [],
  testId = `trend-chart-${measure}`,
}: {
  /** Test id of the figure; a page with two charts of one measure gives the second its own. */
  testId?: string;
  /** Vertical marks on the time axis (a detected shift, a recorded event), with a short label. */
  marks?: readonly { period: string; label: string; kind: 'shift' | 'event' }[];
  /** Oldest first. */
  points: readonly TrendChartPoint[];
  measure: TrendMeasure;
  title: string;
  headingLevel?: 2 | 3 | 4;
  thresholds?: FlagThresholds;
}) {
  const size = trendChartSize;
  const area = plotArea(size);
  const { x, y } = trendScales(points, measure, size);
  const name = measure === 'sdi' ? 'SDI' : 'CVR';
  const format = (value: number) => (measure === 'sdi' ? formatSigned(value) : value.toFixed(2));
  const severityOf = (value: number): Severity =>
    measure === 'sdi' ? classifySdi(value, thresholds) : classifyCvr(value, thresholds);
  const withValues = points
    .map((point, index) => ({ point, index }))
    .filter(
      (entry): entry is { point: { period: string; value: number }; index: number } =>
        entry.point.value !== null,
    );
  const navigation = usePointNavigation(withValues.length);
  const active = navigation.active !== null ? withValues[navigation.active] : null;
  const path =
    line<TrendChartPoint>()
      .defined((p) => p.value !== null)
      .x((p) => x(p.period) ?? 0)
      .y((p) => y(p.value ?? 0))(points) ?? '';
  const describe = (period: string, value: number | null) =>
    value === null
      ? `${formatPeriod(period)}: no ${name}`
      : `${formatPeriod(period)}: ${name} ${format(value)} (${severityLabels[severityOf(value)].toLowerCase()})`;

  // Guides: SDI at ±acceptable and ±warning (±2 and ±3 by default); CVR at fine, acceptable, warning.
  const guides =
    measure === 'sdi'
      ? [
          { value: 0, stroke: 'var(--color-slate-500)', dash: undefined, label: '0' },
          {
            value: thresholds.acceptable,
            stroke: 'var(--color-brass-500)',
            dash: '5 3',
            label: `+${thresholds.acceptable}`,
          },
          {
            value: -thresholds.acceptable,
            stroke: 'var(--color-brass-500)',
            dash: '5 3',
            label: `−${thresholds.acceptable}`,
          },
          {
            value: thresholds.warning,
            stroke: 'var(--color-alarm-700)',
            dash: undefined,
            label: `+${thresholds.warning}`,
          },
          {
            value: -thresholds.warning,
            stroke: 'var(--color-alarm-700)',
            dash: undefined,
            label: `−${thresholds.warning}`,
          },
        ]
      : [
          {
            value: thresholds.fine,
            stroke: 'var(--color-slate-500)',
            dash: undefined,
            label: String(thresholds.fine),
          },
          {
            value: thresholds.acceptable,
            stroke: 'var(--color-brass-500)',
            dash: '5 3',
            label: String(thresholds.acceptable),
          },
          {
            value: thresholds.warning,
            stroke: 'var(--color-alarm-700)',
            dash: undefined,
            label: String(thresholds.warning),
          },
        ];

  return (
    <ChartFigure
      title={title}
      headingLevel={headingLevel}
      size={size}
      testId={testId}
      description={
        measure === 'sdi'
          ? `Your lab's SDI each month: 0 is the peer mean. Beyond the dashed lines (±${thresholds.acceptable}) is a warning, beyond the solid lines (±${thresholds.warning}) calls for action.`
          : `Your lab's CVR each month: 1 means your CV equals the peers' within-lab CV. Above the dashed line (${thresholds.acceptable}) is a warning, above the solid line (${thresholds.warning}) calls for action.`
      }
      readout={active ? describe(active.point.period, active.point.value) : null}
      legend={[
        { key: 'line', symbol: <LineSwatch stroke="var(--color-plumb-700)" />, label: `Your lab's ${name}` },
        {
          key: 'warning-line',
          symbol: <LineSwatch stroke="var(--color-brass-500)" dash="5 3" />,
          label: 'Warning limit',
        },
        { key: 'action-line', symbol: <LineSwatch stroke="var(--color-alarm-700)" />, label: 'Action limit' },
        ...(['fine', 'acceptable', 'warning', 'action'] as const).map((severity) => ({
          key: severity,
          symbol: (
            <MarkerSwatch
              path={markerPath(severityStyles[severity].symbol, 50)}
              fill={severityStyles[severity].fill}
              stroke={severityStyles[severity].stroke}
            />
          ),
          label: severityLabels[severity],
        })),
      ]}
      table={
        <ChartTable
          caption={`${title}: values`}
          headers={['Month', name, 'Flag']}
          rows={points.map((p) => ({
            key: p.period,
            cells: [
              formatPeriod(p.period),
              p.value === null ? '—' : format(p.value),
              p.value === null ? 'no figure' : severityLabels[severityOf(p.value)],
            ],
          }))}
        />
      }
    >
      <AxisBottom scale={x} y={area.bottom} format={shortPeriod} label="Month" />
      <AxisLeft
        scale={y}
        x={area.left}
        tickCount={6}
        format={(v: number) => (measure === 'sdi' ? formatSigned(v, 0) : String(v))}
        label={name}
        gridTo={area.right}
      />
      <g aria-hidden="true">
        {guides.map((guide) => (
          <line
            key={guide.label}
            data-guide={guide.value}
            x1={area.left}
            x2={area.right}
            y1={y(guide.value)}
            y2={y(guide.value)}
            stroke={guide.stroke}
            strokeDasharray={guide.dash}
            strokeWidth={1.25}
          />
        ))}
        <path d={path} fill="none" stroke="var(--color-plumb-700)" strokeWidth={2} />
      </g>
      <g>
        {marks
          .filter((mark) => x(mark.period) !== undefined)
          .map((mark, index) => (
            <g key={`${mark.kind}-${mark.period}-${index}`} data-mark={mark.kind} data-period={mark.period}>
              <title>{mark.label}</title>
              <line
                x1={x(mark.period)}
                x2={x(mark.period)}
                y1={area.top}
                y2={area.bottom}
                stroke={mark.kind === 'shift' ? 'var(--color-alarm-700)' : 'var(--color-slate-500)'}
                strokeDasharray={mark.kind === 'shift' ? '2 2' : '6 3'}
                strokeWidth={1.5}
              />
              <text
                x={(x(mark.period) ?? 0) + 3}
                y={area.top + 10 + 12 * (index % 3)}
                fontSize={10}
                fill={mark.kind === 'shift' ? 'var(--color-alarm-700)' : 'var(--color-slate-700)'}
              >
                {mark.kind === 'shift' ? 'shift' : 'event'}
              </text>
            </g>
          ))}
      </g>
      <g>
        {withValues.map(({ point }, index) => {
          const severity = severityOf(point.value);
          const style = severityStyles[severity];
          return (
            <g key={point.period} transform={`translate(${x(point.period) ?? 0},${y(point.value)})`}>
              {navigation.active === index ? (
                <circle r={10} fill="none" stroke="var(--color-brass-500)" strokeWidth={2} />
              ) : null}
              <path
                {...navigation.pointProps(index)}
                role="img"
                aria-label={describe(point.period, point.value)}
                data-period={point.period}
                data-value={point.value}
                data-severity={severity}
                d={markerPath(style.symbol, 70)}
                fill={style.fill}
                stroke={style.stroke}
                strokeWidth={1.5}
                className="cursor-pointer outline-none"
              />
            </g>
          );
        })}
      </g>
    </ChartFigure>
  );
}
