// Levey-Jennings chart of one level's daily control values against a target mean and SD: lines at the
// mean and at ±1, ±2 and ±3 SD, the values in time order, and every multirule violation marked on the
// point that completed it, with the rule's name written beside it.
import { line, scaleLinear, scaleTime, symbolCircle } from 'd3';
import { AxisBottom, AxisLeft } from './axis.tsx';
import { ChartFigure, ChartTable, LineSwatch, MarkerSwatch } from './chart-figure.tsx';
import { formatSigned, plotArea, type ChartSize } from './chart-layout.ts';
import { markerPath, severityStyles } from './severity.tsx';
import { usePointNavigation } from './use-point-navigation.ts';

export type ControlChartPoint = {
  key: string;
  /** ISO date-time of the measurement. */
  at: string;
  value: number;
  run?: string | null;
  /** Multirule rules this point takes part in violating, e.g. ['1-3s']; empty when none. */
  rules: readonly string[];
};

export type ControlTarget = { mean: number; sd: number };

export const leveyJenningsSize: ChartSize = {
  width: 760,
  height: 320,
  margin: { top: 22, right: 88, bottom: 46, left: 62 },
};

const WARNING_ONLY = new Set(['1-2s']);

/** The rules written beside a point: the rejection rules when there are any (a 1-3s point is also 1-2s). */
export function labelledRules(rules: readonly string[]): string[] {
  const rejections = rules.filter((rule) => !WARNING_ONLY.has(rule));
  return rejections.length > 0 ? rejections : [...rules];
}

/** 'reject' when a rejection rule is broken, 'warn' on 1-2s alone, else 'accept'. */
export function pointVerdict(rules: readonly string[]): 'accept' | 'warn' | 'reject' {
  if (rules.length === 0) return 'accept';
  return rules.every((rule) => WARNING_ONLY.has(rule)) ? 'warn' : 'reject';
}

export function leveyJenningsScales(
  points: readonly ControlChartPoint[],
  target: ControlTarget,
  size: ChartSize = leveyJenningsSize,
) {
  const area = plotArea(size);
  const times = points.map((p) => Date.parse(p.at));
  const halfDay = 12 * 60 * 60 * 1000;
  const first = times.length > 0 ? Math.min(...times) : Date.now();
  const last = times.length > 0 ? Math.max(...times) : Date.now();
  const x = scaleTime()
    .domain([new Date(first - halfDay), new Date(last + halfDay)])
    .range(area.xRange);
  // At least ±4 SD, so every guide shows; wider when a value lies further out.
  const furthest = Math.max(4, ...points.map((p) => Math.abs((p.value - target.mean) / target.sd) + 0.3));
  const y = scaleLinear()
    .domain([target.mean - furthest * target.sd, target.mean + furthest * target.sd])
    .range(area.yRange);
  return { x, y };
}

function formatWhen(at: string): string {
  const date = new Date(at);
  if (Number.isNaN(date.getTime())) return at;
  return new Intl.DateTimeFormat(undefined, {
    day: 'numeric',
    month: 'short',
    hour: '2-digit',
    minute: '2-digit',
  }).format(date);
}

function formatDay(date: Date): string {
  return new Intl.DateTimeFormat(undefined, { day: 'numeric', month: 'short' }).format(date);
}

export function LeveyJenningsChart({
  points,
  target,
  targetLabel,
  unit,
  decimals,
  level,
  title = `Control chart, level ${level}`,
  headingLevel,
  events = [],
}: {
  /** Recorded events of the procedure ('YYYY-MM-DD'), marked on the time axis when within the chart. */
  events?: readonly { day: string; label: string }[];
  /** In time order. */
  points: readonly ControlChartPoint[];
  target: ControlTarget;
  /** Where the target comes from, e.g. "your lab's cumulative figures". */
  targetLabel: string;
  unit: string;
  decimals: number;
  level: number;
  title?: string;
  headingLevel?: 2 | 3 | 4;
}) {
  const size = leveyJenningsSize;
  const area = plotArea(size);
  const { x, y } = leveyJenningsScales(points, target, size);
  const navigation = usePointNavigation(points.length);
  const shown = decimals + 1;
  const fmt = (value: number) => value.toFixed(shown);
  const zOf = (value: number) => (value - target.mean) / target.sd;
  const describe = (point: ControlChartPoint) => {
    const verdict = pointVerdict(point.rules);
    const rules =
      verdict === 'accept'
        ? 'no rule broken'
        : `${verdict === 'reject' ? 'rejection' : 'warning'}: ${point.rules.join(', ')}`;
    return `${formatWhen(point.at)}${point.run ? `, run ${point.run}` : ''}: ${fmt(point.value)} ${unit}, ${formatSigned(zOf(point.value))} SD, ${rules}`;
  };
  const guides = [-3, -2, -1, 0, 1, 2, 3].map((k) => ({
    k,
    value: target.mean + k * target.sd,
    stroke:
      Math.abs(k) === 3
        ? 'var(--color-alarm-700)'
        : Math.abs(k) === 2
          ? 'var(--color-brass-500)'
          : k === 0
            ? 'var(--color-plumb-800)'
            : 'var(--color-slate-400)',
    dash: Math.abs(k) === 2 ? '6 3' : Math.abs(k) === 1 ? '2 3' : undefined,
    label: k === 0 ? 'Mean' : `${k > 0 ? '+' : '−'}${Math.abs(k)} SD`,
  }));
  const path =
    line<ControlChartPoint>()
      .x((p) => x(new Date(p.at)))
      .y((p) => y(p.value))(points) ?? '';
  const active = navigation.active !== null ? points[navigation.active] : null;
  const violations = points.filter((p) => p.rules.length > 0).length;

  return (
    <ChartFigure
      title={title}
      headingLevel={headingLevel}
      size={size}
      testId={`levey-jennings-level-${level}`}
      description={`Daily control values of level ${level} in ${unit} against ${targetLabel} (mean ${fmt(target.mean)}, SD ${fmt(target.sd)}). Lines at the mean and at ±1, ±2 and ±3 SD. ${
        violations === 0
          ? 'No multirule violation.'
          : `${violations} value${violations === 1 ? '' : 's'} break${violations === 1 ? 's' : ''} a multirule rule; each is marked and labelled with its rule.`
      }`}
      readout={active ? describe(active) : null}
      legend={[
        {
          key: 'values',
          symbol: (
            <MarkerSwatch path={markerPath(symbolCircle, 40)} fill="var(--color-plumb-600)" stroke="white" />
          ),
          label: 'Control value',
        },
        {
          key: 'warn',
          symbol: (
            <MarkerSwatch
              path={markerPath(severityStyles.warning.symbol, 60)}
              fill={severityStyles.warning.fill}
              stroke={severityStyles.warning.stroke}
            />
          ),
          label: 'Warning (1-2s)',
        },
        {
          key: 'reject',
          symbol: (
            <MarkerSwatch
              path={markerPath(severityStyles.action.symbol, 60)}
              fill={severityStyles.action.fill}
              stroke={severityStyles.action.stroke}
            />
          ),
          label: 'Rejection (1-3s, 2-2s, R-4s, 4-1s, 10-x)',
        },
        { key: 'two', symbol: <LineSwatch stroke="var(--color-brass-500)" dash="6 3" />, label: '±2 SD' },
        { key: 'three', symbol: <LineSwatch stroke="var(--color-alarm-700)" />, label: '±3 SD' },
      ]}
      table={
        <ChartTable
          caption={`${title}: values`}
          headers={['Measured', 'Run', `Value (${unit})`, 'SD from target', 'Rules broken']}
          rows={points.map((p) => ({
            key: p.key,
            emphasis: p.rules.length > 0,
            cells: [
              formatWhen(p.at),
              p.run ?? '—',
              fmt(p.value),
              formatSigned(zOf(p.value)),
              p.rules.length > 0 ? p.rules.join(', ') : '—',
            ],
          }))}
        />
      }
    >
      <AxisBottom
        scale={x}
        y={area.bottom}
        tickCount={8}
        format={(d: Date) => formatDay(d)}
        label="Date measured"
      />
      <AxisLeft
        scale={y}
        x={area.left}
        tickCount={8}
        format={(v: number) => v.toFixed(Math.max(0, decimals))}
        label={unit}
      />
      <g>
        {events
          .map((event) => ({ event, at: x(new Date(`${event.day}T12:00:00Z`)) }))
          .filter(({ at }) => at >= area.left && at <= area.right)
          .map(({ event, at }, index) => (
            <g key={`${event.day}-${index}`} data-mark="event" data-day={event.day}>
              <title>{event.label}</title>
              <line
                x1={at}
                x2={at}
                y1={area.top}
                y2={area.bottom}
                stroke="var(--color-slate-500)"
                strokeDasharray="6 3"
                strokeWidth={1.5}
              />
            </g>
          ))}
      </g>
      <g aria-hidden="true">
        {guides.map((guide) => (
          <g key={guide.k}>
            <line
              data-sd-line={guide.k}
              x1={area.left}
              x2={area.right}
              y1={y(guide.value)}
              y2={y(guide.value)}
              stroke={guide.stroke}
              strokeDasharray={guide.dash}
              strokeWidth={guide.k === 0 ? 1.5 : 1.25}
            />
            <text
              x={area.right + 6}
              y={y(guide.value)}
              dy="0.32em"
              className="text-[11px]"
              fill="var(--color-slate-700)"
            >
              {guide.label} <tspan fill="var(--color-slate-500)">{fmt(guide.value)}</tspan>
            </text>
          </g>
        ))}
        <path d={path} fill="none" stroke="var(--color-plumb-300)" strokeWidth={1.25} />
      </g>
      <g>
        {points.map((point, index) => {
          const verdict = pointVerdict(point.rules);
          const style =
            verdict === 'reject' ? severityStyles.action : verdict === 'warn' ? severityStyles.warning : null;
          const px = x(new Date(point.at));
          const py = y(point.value);
          const labelAbove = py > area.top + 24;
          return (
            <g key={point.key} transform={`translate(${px},${py})`} data-point-key={point.key}>
              {navigation.active === index ? (
                <circle r={9} fill="none" stroke="var(--color-brass-500)" strokeWidth={2} />
              ) : null}
              <path
                {...navigation.pointProps(index)}
                role="img"
                aria-label={describe(point)}
                data-value={point.value}
                data-rules={point.rules.join(' ')}
                d={markerPath(style ? style.symbol : symbolCircle, style ? 90 : 34)}
                fill={style ? style.fill : 'var(--color-plumb-600)'}
                stroke={style ? style.stroke : 'white'}
                strokeWidth={style ? 1.5 : 1}
                className="cursor-pointer outline-none"
              />
              {point.rules.length > 0 ? (
                <text
                  aria-hidden="true"
                  data-rule-label={labelledRules(point.rules).join(' ')}
                  y={labelAbove ? -10 : 18}
                  textAnchor="middle"
                  className="text-[11px] font-semibold"
                  fill={verdict === 'reject' ? 'var(--color-alarm-800)' : 'var(--color-brass-700)'}
                  stroke="white"
                  strokeWidth={3}
                  paintOrder="stroke"
                >
                  {labelledRules(point.rules).join(' ')}
                </text>
              ) : null}
            </g>
          );
        })}
      </g>
    </ChartFigure>
  );
}
