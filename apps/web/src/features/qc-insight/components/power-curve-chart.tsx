// Power curves of QC plans: probability of rejecting a run against the systematic shift (in SDs),
// with the procedure's critical shift and the Ped target marked.
import { useMemo } from 'react';
import { line, scaleLinear } from 'd3';
import { evaluateQcPlan, type QcPlan } from '@plumbline/stats';

const WIDTH = 420;
const HEIGHT = 240;
const MARGIN = { top: 12, right: 16, bottom: 40, left: 48 };
const SHIFTS = Array.from({ length: 25 }, (_, i) => i * 0.25);
const COLORS = ['var(--color-plumb-700)', 'var(--color-brass-500)'];

export function PowerCurveChart({
  plans,
  deltaSeCrit,
  minPed,
}: {
  plans: readonly { label: string; plan: QcPlan }[];
  deltaSeCrit: number | null;
  minPed: number;
}) {
  // Single rules in closed form; multirules by 500 simulated groups per point (Monte Carlo SE ≤ 0.023).
  const curves = useMemo(
    () =>
      plans.map(({ label, plan }) => ({
        label,
        points: SHIFTS.map((shift) => ({ shift, ped: evaluateQcPlan(plan, shift, 500).ped })),
      })),
    [plans],
  );
  const x = scaleLinear()
    .domain([0, 6])
    .range([MARGIN.left, WIDTH - MARGIN.right]);
  const y = scaleLinear()
    .domain([0, 1])
    .range([HEIGHT - MARGIN.bottom, MARGIN.top]);
  const path = line<{ shift: number; ped: number }>()
    .x((p) => x(p.shift))
    .y((p) => y(p.ped));
  return (
    <figure className="space-y-2" data-testid="power-curves">
      <svg
        viewBox={`0 0 ${WIDTH} ${HEIGHT}`}
        className="w-full max-w-md"
        role="img"
        aria-label="Power curves of the QC plans"
      >
        {[0, 0.25, 0.5, 0.75, 1].map((v) => (
          <g key={v}>
            <line
              x1={MARGIN.left}
              x2={WIDTH - MARGIN.right}
              y1={y(v)}
              y2={y(v)}
              stroke="var(--color-slate-200)"
            />
            <text
              x={MARGIN.left - 6}
              y={y(v) + 3}
              fontSize={10}
              textAnchor="end"
              fill="var(--color-slate-600)"
            >
              {v.toFixed(2)}
            </text>
          </g>
        ))}
        {[0, 1, 2, 3, 4, 5, 6].map((v) => (
          <text
            key={v}
            x={x(v)}
            y={HEIGHT - MARGIN.bottom + 14}
            fontSize={10}
            textAnchor="middle"
            fill="var(--color-slate-600)"
          >
            {v}
          </text>
        ))}
        <text
          x={(MARGIN.left + WIDTH - MARGIN.right) / 2}
          y={HEIGHT - 6}
          fontSize={11}
          textAnchor="middle"
          fill="var(--color-slate-700)"
        >
          Systematic shift (SDs)
        </text>
        <text
          transform={`translate(12,${(HEIGHT - MARGIN.bottom) / 2}) rotate(-90)`}
          fontSize={11}
          textAnchor="middle"
          fill="var(--color-slate-700)"
        >
          Probability of rejection
        </text>
        <line
          x1={MARGIN.left}
          x2={WIDTH - MARGIN.right}
          y1={y(minPed)}
          y2={y(minPed)}
          stroke="var(--color-alarm-700)"
          strokeDasharray="4 3"
        />
        {deltaSeCrit !== null && deltaSeCrit >= 0 && deltaSeCrit <= 6 ? (
          <line
            x1={x(deltaSeCrit)}
            x2={x(deltaSeCrit)}
            y1={MARGIN.top}
            y2={HEIGHT - MARGIN.bottom}
            stroke="var(--color-alarm-700)"
          />
        ) : null}
        {curves.map((curve, i) => (
          <path
            key={curve.label}
            d={path(curve.points) ?? ''}
            fill="none"
            stroke={COLORS[i % COLORS.length]}
            strokeWidth={2}
          />
        ))}
      </svg>
      <figcaption className="text-xs text-slate-600">
        {curves.map((curve, i) => (
          <span key={curve.label} className="mr-4" style={{ color: COLORS[i % COLORS.length] }}>
            ━ {curve.label}
          </span>
        ))}
        Solid red line: critical shift ΔSEcrit
        {deltaSeCrit === null ? ' (no sigma)' : ` ${deltaSeCrit.toFixed(2)}`}; dashed: Ped target {minPed}.
      </figcaption>
    </figure>
  );
}
