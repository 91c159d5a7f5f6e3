// Where the lab's mean sits among the peer group's lab means: one dot per lab along the value axis
// (stacked where they would overlap), the peer mean and its ±2 and ±3 SD, our lab marked and named,
// the other labs anonymous, and labs left out of the peer figures drawn as crosses.
import { scaleLinear, symbolCircle, symbolX } from 'd3';
import { AxisBottom } from './axis.tsx';
import { ChartFigure, ChartTable, LineSwatch, MarkerSwatch } from './chart-figure.tsx';
import { formatSigned, plotArea, type ChartSize } from './chart-layout.ts';
import { markerPath, ownLabShape } from './severity.tsx';
import { usePointNavigation } from './use-point-navigation.ts';

export type LabMeanPoint = {
  /** An opaque key; never shown. */
  key: string;
  mean: number;
  isOwnLab: boolean;
  /** Left out of the peer figures (an outlier, or by the coordinator). */
  excluded?: boolean;
};

export const peerDistributionSize: ChartSize = {
  width: 620,
  height: 240,
  margin: { top: 40, right: 24, bottom: 46, left: 24 },
};

export function peerDistributionScale(
  points: readonly LabMeanPoint[],
  peer: { mean: number; sd: number },
  size: ChartSize = peerDistributionSize,
) {
  const values = [...points.map((p) => p.mean), peer.mean - 3.5 * peer.sd, peer.mean + 3.5 * peer.sd];
  const low = Math.min(...values);
  const high = Math.max(...values);
  const pad = (high - low) * 0.03 || 1;
  return scaleLinear()
    .domain([low - pad, high + pad])
    .range(plotArea(size).xRange)
    .nice();
}

/**
 * Stacks dots that would overlap: each dot (in order of value) goes to the lowest row where no dot
 * already placed lies within one diameter. Returns the row of each point, by key.
 */
export function stackRows(xs: readonly { key: string; x: number }[], diameter: number): Map<string, number> {
  const rows = new Map<string, number>();
  const lastXInRow: number[] = [];
  for (const { key, x } of [...xs].sort((a, b) => a.x - b.x)) {
    let row = lastXInRow.findIndex((last) => x - last >= diameter);
    if (row === -1) row = lastXInRow.length;
    lastXInRow[row] = x;
    rows.set(key, row);
  }
  return rows;
}

export function PeerDistributionChart({
  points,
  peer,
  unit,
  decimals,
  title = 'Lab means in the peer group',
  headingLevel,
}: {
  points: readonly LabMeanPoint[];
  peer: { mean: number; sd: number };
  unit: string;
  decimals: number;
  title?: string;
  headingLevel?: 2 | 3 | 4;
}) {
  const size = peerDistributionSize;
  const area = plotArea(size);
  const x = peerDistributionScale(points, peer, size);
  const fmt = (value: number) => value.toFixed(decimals + 1);
  const sdiOf = (value: number) => (peer.sd > 0 ? (value - peer.mean) / peer.sd : 0);

  // Dots shrink when the group is large, so every lab still fits above the axis.
  const available = area.bottom - area.top;
  let diameter = 12;
  let rows = stackRows(
    points.map((p) => ({ key: p.key, x: x(p.mean) })),
    diameter,
  );
  while (diameter > 3 && (Math.max(0, ...rows.values()) + 1) * diameter > available) {
    diameter -= 1;
    rows = stackRows(
      points.map((p) => ({ key: p.key, x: x(p.mean) })),
      diameter,
    );
  }
  const area2 = (diameter / 2) ** 2 * Math.PI;

  const ordered = [...points].sort((a, b) => a.mean - b.mean);
  let otherCount = 0;
  const names = new Map(ordered.map((p) => [p.key, p.isOwnLab ? 'Your lab' : `Other lab ${++otherCount}`]));
  const navigation = usePointNavigation(ordered.length);
  const describe = (p: LabMeanPoint) =>
    `${names.get(p.key)}: mean ${fmt(p.mean)} ${unit}, ${formatSigned(sdiOf(p.mean))} SD from the peer mean${p.excluded ? ', left out of the peer figures' : ''}`;
  const active = navigation.active !== null ? ordered[navigation.active] : null;
  const guides = [-3, -2, 0, 2, 3].map((k) => ({
    k,
    value: peer.mean + k * peer.sd,
    stroke:
      k === 0
        ? 'var(--color-plumb-800)'
        : Math.abs(k) === 2
          ? 'var(--color-brass-500)'
          : 'var(--color-alarm-700)',
    dash: Math.abs(k) === 2 ? '6 3' : undefined,
    label: k === 0 ? 'Peer mean' : `${k > 0 ? '+' : '−'}${Math.abs(k)} SD`,
  }));

  return (
    <ChartFigure
      title={title}
      headingLevel={headingLevel}
      size={size}
      testId="peer-distribution"
      description={`Each dot is one lab's mean in ${unit}. The solid line is the peer mean (${fmt(peer.mean)}), the dashed lines ±2 SD and the outer lines ±3 SD of the peer group. Your lab is the square; other labs are not named; crosses are labs left out of the peer figures.`}
      readout={active ? describe(active) : null}
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
              path={markerPath(symbolCircle, 50)}
              fill="var(--color-slate-300)"
              stroke="var(--color-slate-500)"
            />
          ),
          label: 'Another lab',
        },
        {
          key: 'excluded',
          symbol: (
            <MarkerSwatch
              path={markerPath(symbolX, 50)}
              fill="var(--color-slate-500)"
              stroke="var(--color-slate-600)"
            />
          ),
          label: 'Left out of the peer figures',
        },
        { key: 'mean', symbol: <LineSwatch stroke="var(--color-plumb-800)" />, label: 'Peer mean' },
        { key: 'two', symbol: <LineSwatch stroke="var(--color-brass-500)" dash="6 3" />, label: '±2 SD' },
        { key: 'three', symbol: <LineSwatch stroke="var(--color-alarm-700)" />, label: '±3 SD' },
      ]}
      table={
        <ChartTable
          caption={`${title}: values`}
          headers={['Lab', `Mean (${unit})`, 'SD from peer mean', 'In peer figures']}
          rows={ordered.map((p) => ({
            key: p.key,
            emphasis: p.isOwnLab,
            cells: [
              names.get(p.key) ?? '',
              fmt(p.mean),
              formatSigned(sdiOf(p.mean)),
              p.excluded ? 'no, left out' : 'yes',
            ],
          }))}
        />
      }
    >
      <AxisBottom
        scale={x}
        y={area.bottom}
        tickCount={8}
        format={(v: number) => String(v)}
        label={`Lab mean (${unit})`}
      />
      <g aria-hidden="true">
        {guides.map((guide) => (
          <g key={guide.k}>
            <line
              x1={x(guide.value)}
              x2={x(guide.value)}
              y1={area.top - 6}
              y2={area.bottom}
              stroke={guide.stroke}
              strokeDasharray={guide.dash}
              strokeWidth={guide.k === 0 ? 1.75 : 1.25}
            />
            <text
              x={x(guide.value)}
              y={area.top - 12}
              textAnchor="middle"
              className="text-[11px]"
              fill="var(--color-slate-700)"
            >
              {guide.label}
            </text>
          </g>
        ))}
      </g>
      <g>
        {ordered.map((point, index) => {
          const row = rows.get(point.key) ?? 0;
          const cx = x(point.mean);
          const cy = area.bottom - diameter / 2 - row * diameter;
          const shape = point.isOwnLab ? ownLabShape : point.excluded ? symbolX : symbolCircle;
          return (
            <g key={point.key} transform={`translate(${cx},${cy})`}>
              {navigation.active === index ? (
                <circle r={diameter / 2 + 4} fill="none" stroke="var(--color-brass-500)" strokeWidth={2} />
              ) : null}
              <path
                {...navigation.pointProps(index)}
                role="img"
                aria-label={describe(point)}
                data-own-lab={point.isOwnLab ? 'true' : undefined}
                data-mean={point.mean}
                d={markerPath(shape, point.isOwnLab ? area2 * 1.6 : area2)}
                fill={
                  point.isOwnLab
                    ? 'var(--color-plumb-700)'
                    : point.excluded
                      ? 'var(--color-slate-500)'
                      : 'var(--color-slate-300)'
                }
                stroke={point.isOwnLab ? 'white' : 'var(--color-slate-500)'}
                strokeWidth={1.25}
                className="cursor-pointer outline-none"
              />
            </g>
          );
        })}
        {ordered
          .filter((p) => p.isOwnLab)
          .map((p) => {
            const row = rows.get(p.key) ?? 0;
            const cy = area.bottom - diameter / 2 - row * diameter;
            return (
              <text
                key={`label-${p.key}`}
                aria-hidden="true"
                x={x(p.mean)}
                y={cy - diameter / 2 - 6}
                textAnchor="middle"
                className="text-[12px] font-semibold"
                fill="var(--color-plumb-900)"
                stroke="white"
                strokeWidth={3}
                paintOrder="stroke"
              >
                {p.excluded ? 'Your lab (left out)' : 'Your lab'}
              </text>
            );
          })}
      </g>
    </ChartFigure>
  );
}
