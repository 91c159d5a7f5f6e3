// The statistics before and after an adjustment, side by side, per level: each touched group with
// its members and figures. Nothing is written until the coordinator confirms.
import type { AdjustmentPreview, PeerGroupFigures, PreviewGroup } from '@plumbline/contracts';
import { Badge } from '../../../components/ui/badge.tsx';
import { formatPeriod } from '../../../utils/format.ts';
import { formatPercent, formatValue, meanDecimals, tierTitles } from '../utils/figures.ts';

/** A short list of a group's figures. */
export function FiguresList({
  figures,
  decimals,
  unit,
}: {
  figures: PeerGroupFigures | null;
  decimals: number;
  unit: string;
}) {
  if (!figures)
    return <p className="text-sm text-slate-500">No member has data for this level and period.</p>;
  const d = meanDecimals(decimals);
  const items = [
    { term: 'Labs in the figures', value: String(figures.labs) },
    { term: 'Values (n)', value: String(figures.n) },
    { term: `Mean (${unit})`, value: formatValue(figures.mean, d) },
    { term: `SD (${unit})`, value: formatValue(figures.sd, d) },
    { term: 'CV %', value: formatPercent(figures.cv) },
    { term: 'Within-lab CV %', value: formatPercent(figures.withinCv) },
  ];
  return (
    <dl className="figures grid grid-cols-[auto_1fr] gap-x-4 gap-y-0.5 text-sm">
      {items.map((item) => (
        <div key={item.term} className="contents">
          <dt className="text-slate-600">{item.term}</dt>
          <dd className="text-right font-medium text-slate-900">{item.value}</dd>
        </div>
      ))}
    </dl>
  );
}

function GroupCard({ group, decimals, unit }: { group: PreviewGroup; decimals: number; unit: string }) {
  const codeOf = new Map(group.members.map((m) => [m.procedureId, `${m.lab.code} ${m.procedureCode}`]));
  const excluded = group.figures?.excluded ?? [];
  return (
    <article aria-label={group.label} className="rounded-md border border-slate-200 bg-white p-3">
      <header className="mb-2">
        <h5 className="text-sm font-semibold text-plumb-900">{group.label}</h5>
        <p className="text-xs text-slate-500">
          {tierTitles[group.tier]}
          {group.id === null ? ' · new group' : ''}
        </p>
        <p className="mt-1 text-xs text-slate-700">
          {group.members.length === 0
            ? 'No members'
            : `Members: ${group.members.map((m) => m.lab.code).join(', ')}`}
        </p>
      </header>
      {group.notComputable ? (
        <p className="text-sm text-alarm-700">The figures cannot be computed: {group.notComputable.reason}</p>
      ) : (
        <FiguresList figures={group.figures} decimals={decimals} unit={unit} />
      )}
      <div className="mt-2 flex flex-wrap gap-1">
        {group.figures && !group.figures.sufficient ? (
          <Badge tone="brass">Too few labs to publish</Badge>
        ) : null}
        {excluded.map((x) => (
          <Badge key={x.procedureId} tone={x.reason === 'outlier' ? 'alarm' : 'neutral'}>
            {codeOf.get(x.procedureId) ?? 'A member'}{' '}
            {x.reason === 'outlier' ? 'left out as outlier' : 'excluded by you'}
          </Badge>
        ))}
      </div>
    </article>
  );
}

export function PreviewPanel({
  preview,
  decimals,
  unit,
}: {
  preview: AdjustmentPreview;
  decimals: number;
  unit: string;
}) {
  return (
    <section aria-label="Preview of the change" className="space-y-4">
      <p className="text-sm text-slate-700">
        <span className="font-semibold text-plumb-900">{preview.description}.</span> Figures for{' '}
        {formatPeriod(preview.period)}; nothing changes until you confirm.
      </p>
      {preview.levels.map((level) => (
        <div key={level.level}>
          {preview.levels.length > 1 ? (
            <h4 className="mb-2 text-sm font-semibold text-slate-800">Level {level.level}</h4>
          ) : null}
          <div className="grid gap-3 md:grid-cols-2">
            <section
              aria-label={`Before, level ${level.level}`}
              className="space-y-2 rounded-lg bg-slate-50 p-3"
            >
              <h4 className="text-xs font-semibold tracking-wider text-slate-600 uppercase">Before</h4>
              {level.before.map((group, index) => (
                <GroupCard key={group.id ?? index} group={group} decimals={decimals} unit={unit} />
              ))}
            </section>
            <section
              aria-label={`After, level ${level.level}`}
              className="space-y-2 rounded-lg bg-plumb-50 p-3"
            >
              <h4 className="text-xs font-semibold tracking-wider text-plumb-800 uppercase">After</h4>
              {level.after.map((group, index) => (
                <GroupCard key={group.id ?? index} group={group} decimals={decimals} unit={unit} />
              ))}
            </section>
          </div>
        </div>
      ))}
    </section>
  );
}
