// Two-level SDI plot: each lab of the peer group is one point, its SDI at one level across and at the
// other level up. Points near the diagonal moved the same way at both levels (a systematic error);
// points far from it disagree between levels (a random error or a level-specific problem). Our lab
// is marked and named; the other labs stay anonymous.
import { scaleLinear, symbolCircle } from 'd3';
import { plotArea, formatSigned, symmetricSdiLimit, type ChartSize } from './chart-layout.ts';
import { AxisBottom, AxisLeft } from './axis.tsx';
import { ChartFigure, ChartTable, LineSwatch, MarkerSwatch } from './chart-figure.tsx';
import { markerPath, ownLabShape } from './severity.tsx';
import { usePointNavigation } from './use-point-navigation.ts';

export type TwoLevelPoint = {
  /** An opaque key; never shown. */
  key: string;
  /** SDI at the level on the x axis. */
  x: number;
  /** SDI at the level on the y axis. */
  y: number;
  isOwnLab: boolean;
};

export const twoLevelPlotSize: ChartSize = {
  width: 420,
  height: 420,
  margin: { top: 16, right: 20, bottom: 52, left: 58 },
};

const OTHER_AREA = 48;
const OWN_AREA = 150;

/** Both axes share one symmetric domain, so the diagonal is the 45° line. */
export function twoLevelScales(points: readonly TwoLevelPoint[], size: ChartSize = twoLevelPlotSize) {
  const limit = symmetricSdiLimit(points.flatMap((p) => [p.x, p.y]));
  const area = plotArea(size);
  return {
    limit,
    x: scaleLinear().domain([-limit, limit]).range(area.xRange),
    y: scaleLinear().domain([-limit, limit]).range(area.yRange),
  };
}

function describePoint(point: TwoLevelPoint, name: string, xLevel: number, yLevel: number): string {
  return `${name}: SDI ${formatSigned(point.x)} at level ${xLevel}, ${formatSigned(point.y)} at level ${yLevel}`;
}

export function TwoLevelSdiPlot({
  points,
  xLevel,
  yLevel,
  title = `SDI at level ${xLevel} and level ${yLevel}, every lab of the peer group`,
  headingLevel,
}: {
  points: readonly TwoLevelPoint[];
  xLevel: number;
  yLevel: number;
  title?: string;
  headingLevel?: 2 | 3 | 4;
}) {
  const size = twoLevelPlotSize;
  const area = plotArea(size);
  const { limit, x, y } = twoLevelScales(points, size);
  // Others first (drawn underneath), ours last so it is never hidden; the others numbered in order
  // of their level-one SDI, which says nothing about who they are.
  const others = points.filter((p) => !p.isOwnLab).sort((a, b) => a.x - b.x || a.y - b.y);
  const own = points.filter((p) => p.isOwnLab);
  const ordered = [...others, ...own];
  const names = new Map(ordered.map((p, i) => [p.key, p.isOwnLab ? 'Your lab' : `Other lab ${i + 1}`]));
  const navigation = usePointNavigation(ordered.length);
  const activePoint = navigation.active !== null ? ordered[navigation.active] : null;
  const ticks = Array.from({ length: limit * 2 + 1 }, (_, i) => i - limit);
  const guide = (sd: number) => ({ x: x(-sd), y: y(sd), size: x(sd) - x(-sd) });
  const two = guide(2);
  const three = guide(3);

  return (
    <ChartFigure
      title={title}
      headingLevel={headingLevel}
      size={size}
      testId="two-level-sdi-plot"
      description={`Each point is one lab: its SDI at level ${xLevel} across and at level ${yLevel} up. Points along the diagonal moved the same way at both levels, which suggests a systematic error; points far from it suggest a random error. The inner square is ±2 SD, the outer ±3 SD. Other labs are not named.`}
      readout={
        activePoint ? describePoint(activePoint, names.get(activePoint.key) ?? '', xLevel, yLevel) : null
      }
      legend={[
        {
          key: 'own',
          symbol: (
            <MarkerSwatch path={markerPath(ownLabShape, 60)} fill="var(--color-plumb-700)" stroke="white" />
          ),
          label: 'Your lab',
        },
        {
          key: 'other',
          symbol: (
            <MarkerSwatch
              path={markerPath(symbolCircle, 40)}
              fill="var(--color-slate-200)"
              stroke="var(--color-slate-500)"
            />
          ),
          label: 'Another lab',
        },
        { key: 'two', symbol: <LineSwatch stroke="var(--color-brass-500)" dash="5 3" />, label: '±2 SD' },
        { key: 'three', symbol: <LineSwatch stroke="var(--color-alarm-700)" />, label: '±3 SD' },
        {
          key: 'diagonal',
          symbol: <LineSwatch stroke="var(--color-plumb-400)" dash="2 3" />,
          label: 'Same SDI at both levels',
        },
      ]}
      table={
        <ChartTable
          caption={`${title}: values`}
          headers={['Lab', `SDI level ${xLevel}`, `SDI level ${yLevel}`]}
          rows={ordered.map((p) => ({
            key: p.key,
            emphasis: p.isOwnLab,
            cells: [names.get(p.key) ?? '', formatSigned(p.x), formatSigned(p.y)],
          }))}
        />
      }
    >
      <AxisBottom
        scale={x}
        y={area.bottom}
        tickValues={ticks}
        format={(v: number) => formatSigned(v, 0)}
        label={`SDI, level ${xLevel}`}
      />
      <AxisLeft
        scale={y}
        x={area.left}
        tickValues={ticks}
        format={(v: number) => formatSigned(v, 0)}
        label={`SDI, level ${yLevel}`}
        gridTo={area.right}
      />
      <g aria-hidden="true">
        <line x1={x(0)} x2={x(0)} y1={area.top} y2={area.bottom} stroke="var(--color-slate-400)" />
        <line x1={area.left} x2={area.right} y1={y(0)} y2={y(0)} stroke="var(--color-slate-400)" />
        <rect
          x={three.x}
          y={three.y}
          width={three.size}
          height={three.size}
          fill="none"
          stroke="var(--color-alarm-700)"
          strokeWidth={1.25}
        />
        <rect
          x={two.x}
          y={two.y}
          width={two.size}
          height={two.size}
          fill="var(--color-plumb-50)"
          fillOpacity={0.6}
          stroke="var(--color-brass-500)"
          strokeDasharray="5 3"
          strokeWidth={1.25}
        />
        <line
          data-role="diagonal"
          x1={x(-limit)}
          y1={y(-limit)}
          x2={x(limit)}
          y2={y(limit)}
          stroke="var(--color-plumb-400)"
          strokeDasharray="2 3"
          strokeWidth={1.5}
        />
      </g>
      <g>
        {ordered.map((point, index) => {
          const name = names.get(point.key) ?? '';
          const active = navigation.active === index;
          return (
            <g key={point.key} transform={`translate(${x(point.x)},${y(point.y)})`}>
              {active ? (
                <circle
                  r={point.isOwnLab ? 11 : 8}
                  fill="none"
                  stroke="var(--color-brass-500)"
                  strokeWidth={2}
                />
              ) : null}
              <path
                {...navigation.pointProps(index)}
                role="img"
                aria-label={describePoint(point, name, xLevel, yLevel)}
                data-own-lab={point.isOwnLab ? 'true' : undefined}
                data-sdi-x={point.x}
                data-sdi-y={point.y}
                d={markerPath(
                  point.isOwnLab ? ownLabShape : symbolCircle,
                  point.isOwnLab ? OWN_AREA : OTHER_AREA,
                )}
                fill={point.isOwnLab ? 'var(--color-plumb-700)' : 'var(--color-slate-200)'}
                fillOpacity={point.isOwnLab ? 1 : 0.85}
                stroke={point.isOwnLab ? 'white' : 'var(--color-slate-500)'}
                strokeWidth={1.5}
                className="cursor-pointer outline-none"
              />
              {point.isOwnLab ? (
                <text
                  aria-hidden="true"
                  x={x(point.x) > area.right - 70 ? -10 : 10}
                  y={y(point.y) < area.top + 20 ? 20 : -10}
                  textAnchor={x(point.x) > area.right - 70 ? 'end' : 'start'}
                  className="text-[12px] font-semibold"
                  fill="var(--color-plumb-900)"
                  stroke="white"
                  strokeWidth={3}
                  paintOrder="stroke"
                >
                  Your lab
                </text>
              ) : null}
            </g>
          );
        })}
      </g>
    </ChartFigure>
  );
}
