// One report row in depth: the lab's SDI and CVR month by month, where its mean sits in the peer
// group, the two-level SDI plot, the Levey-Jennings chart of the month's daily values with the
// multirule results against the chosen target, and the measurement uncertainty.
import { useId, useState, type ReactNode } from 'react';
import type { Drilldown } from '@plumbline/contracts';
import { LeveyJenningsChart } from '../../../components/charts/levey-jennings-chart.tsx';
import { PeerDistributionChart } from '../../../components/charts/peer-distribution-chart.tsx';
import { TrendChart } from '../../../components/charts/trend-chart.tsx';
import { TwoLevelSdiPlot } from '../../../components/charts/two-level-sdi-plot.tsx';
import { UncertaintyChart } from '../../../components/charts/uncertainty-chart.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import type { DrilldownParams } from '../api/lab-review-keys.ts';
import { downloadControlChartCsv, downloadTrendCsv } from '../api/review-downloads.ts';
import {
  controlChartPoints,
  labMeanPoints,
  targetBasisWords,
  tierWords,
  twoLevelPoints,
  uncertaintyComponents,
} from '../utils/drilldown-figures.ts';

function signed(value: number | null | undefined, digits = 2): string {
  if (value === null || value === undefined) return '—';
  const text = Math.abs(value).toFixed(digits);
  return Number(text) === 0 ? text : `${value > 0 ? '+' : '\u2212'}${text}`;
}

function Section({ title, children, actions }: { title: string; children: ReactNode; actions?: ReactNode }) {
  const id = useId();
  return (
    <section aria-labelledby={id} className="space-y-3">
      <div className="flex flex-wrap items-end justify-between gap-2 border-b border-slate-200 pb-1.5">
        <h2 id={id} className="text-lg font-semibold text-plumb-950">
          {title}
        </h2>
        {actions}
      </div>
      {children}
    </section>
  );
}

function CsvButton({ label, download }: { label: string; download: () => Promise<void> }) {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="ghost"
      size="xs"
      isLoading={busy}
      onClick={async () => {
        setBusy(true);
        try {
          await download();
        } catch (error) {
          showToast(`The CSV could not be downloaded: ${errorMessage(error)}`, 'error');
        } finally {
          setBusy(false);
        }
      }}
    >
      {label}
    </Button>
  );
}

function Unavailable({ children }: { children: ReactNode }) {
  return (
    <p className="rounded-lg border border-dashed border-slate-300 bg-white px-4 py-6 text-sm text-slate-600">
      {children}
    </p>
  );
}

export function KeyFigures({ drilldown }: { drilldown: Drilldown }) {
  const current =
    drilldown.trend.find((point) => point.period === drilldown.period) ?? drilldown.trend.at(-1);
  const digits = drilldown.decimals + 1;
  const facts = [
    { label: 'SDI', value: signed(current?.sdi) },
    {
      label: 'CVR',
      value: current?.cvr === null || current?.cvr === undefined ? '—' : current.cvr.toFixed(2),
    },
    {
      label: 'Bias',
      value:
        current?.biasPct === null || current?.biasPct === undefined ? '—' : `${signed(current.biasPct, 1)} %`,
    },
    { label: 'Your mean', value: current ? `${current.labMean.toFixed(digits)} ${drilldown.unit}` : '—' },
    { label: 'Your SD', value: current ? current.labSd.toFixed(digits) : '—' },
    {
      label: 'Peer mean',
      value:
        current?.peerMean === null || current?.peerMean === undefined
          ? '—'
          : `${current.peerMean.toFixed(digits)} ${drilldown.unit}`,
    },
    {
      label: 'Peer SD',
      value: current?.peerSd === null || current?.peerSd === undefined ? '—' : current.peerSd.toFixed(digits),
    },
  ];
  return (
    <dl
      className="grid grid-cols-2 gap-2 sm:grid-cols-4 lg:grid-cols-7"
      aria-label={`Figures of ${formatPeriod(drilldown.period)}`}
    >
      {facts.map((fact) => (
        <div key={fact.label} className="rounded-md border border-slate-200 bg-white px-3 py-2 shadow-xs">
          <dt className="text-xs text-slate-500">{fact.label}</dt>
          <dd className="figures mt-0.5 text-base font-semibold whitespace-nowrap text-slate-900">
            {fact.value}
          </dd>
        </div>
      ))}
    </dl>
  );
}

export function DrilldownView({
  drilldown,
  params,
  onTargetChange,
  events = [],
}: {
  drilldown: Drilldown;
  params: DrilldownParams;
  onTargetChange: (target: 'lab' | 'peer') => void;
  /** The procedure's recorded events, marked on the Levey-Jennings chart. */
  events?: readonly { day: string; label: string }[];
}) {
  const targetName = useId();
  const lj = drilldown.leveyJennings;
  const ljPoints = controlChartPoints(drilldown);
  const rejected = lj.runs.filter((run) => run.verdict === 'reject');
  const warned = lj.runs.filter((run) => run.verdict === 'warn');
  const twoLevel = drilldown.twoLevel;
  return (
    <div className="space-y-10">
      <div className="space-y-2">
        <p className="text-sm text-slate-700">
          {drilldown.peer ? (
            <>
              Compared with <span className="font-medium">{drilldown.peer.labs} labs</span> using the{' '}
              <span className="font-medium">{tierWords[drilldown.peer.tier]}</span>.
            </>
          ) : (
            'No peer group had enough labs this month, so there is no peer comparison.'
          )}{' '}
          Means and SDs in {drilldown.unit}.
        </p>
        <KeyFigures drilldown={drilldown} />
        {drilldown.notComputable.length > 0 ? (
          <div
            role="note"
            data-not-computable=""
            className="rounded-md border border-alarm-200 bg-alarm-50 px-3 py-2 text-sm text-slate-800"
          >
            <p className="font-semibold text-alarm-700">Some figures cannot be computed</p>
            <ul className="mt-1 list-disc pl-5 text-xs">
              {drilldown.notComputable.map((reason) => (
                <li key={reason}>{reason}</li>
              ))}
            </ul>
          </div>
        ) : null}
      </div>

      <Section
        title="Standing over the months"
        actions={<CsvButton label="Trend as CSV" download={() => downloadTrendCsv(params)} />}
      >
        {drilldown.trend.length === 0 ? (
          <Unavailable>No earlier months with data for this lot and level.</Unavailable>
        ) : (
          <div className="grid items-start gap-4 xl:grid-cols-2">
            <TrendChart
              measure="sdi"
              title={`SDI over the last ${drilldown.trend.length} month${drilldown.trend.length === 1 ? '' : 's'}`}
              points={drilldown.trend.map((p) => ({ period: p.period, value: p.sdi }))}
            />
            <TrendChart
              measure="cvr"
              title={`CVR over the last ${drilldown.trend.length} month${drilldown.trend.length === 1 ? '' : 's'}`}
              points={drilldown.trend.map((p) => ({ period: p.period, value: p.cvr }))}
            />
          </div>
        )}
      </Section>

      <Section title={`The peer group in ${formatPeriod(drilldown.period)}`}>
        <div className="grid items-start gap-4 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
          {drilldown.distribution ? (
            <PeerDistributionChart
              points={labMeanPoints(drilldown)}
              peer={{ mean: drilldown.distribution.peerMean, sd: drilldown.distribution.peerSd }}
              unit={drilldown.unit}
              decimals={drilldown.decimals}
              title={`Lab means at level ${drilldown.level}`}
            />
          ) : (
            <Unavailable>No peer comparison this month, so no distribution of lab means.</Unavailable>
          )}
          {twoLevel ? (
            <TwoLevelSdiPlot
              points={twoLevelPoints(drilldown)}
              xLevel={twoLevel.levels[0]}
              yLevel={twoLevel.levels[1]}
              title={`Two-level SDI plot, levels ${twoLevel.levels[0]} and ${twoLevel.levels[1]}`}
            />
          ) : (
            <Unavailable>
              The two-level SDI plot needs peer comparisons at two levels of this lot in the same month.
            </Unavailable>
          )}
        </div>
      </Section>

      <Section
        title="Control chart of the daily values"
        actions={
          lj.points.length > 0 ? (
            <CsvButton label="Values as CSV" download={() => downloadControlChartCsv(params)} />
          ) : undefined
        }
      >
        <fieldset className="flex flex-wrap items-center gap-4 text-sm">
          <legend className="sr-only">Target of the control chart</legend>
          <span className="font-medium text-slate-800" aria-hidden="true">
            Target:
          </span>
          {(
            [
              ['lab', "Your lab's figures"],
              ['peer', "The peer group's figures"],
            ] as const
          ).map(([value, label]) => (
            <label key={value} className="inline-flex items-center gap-1.5">
              <input
                type="radio"
                name={targetName}
                value={value}
                checked={params.target === value}
                onChange={() => onTargetChange(value)}
                className="accent-plumb-700"
              />
              {label}
            </label>
          ))}
        </fieldset>
        {lj.points.length === 0 || !lj.target ? (
          <Unavailable>
            {lj.points.length === 0
              ? 'Your lab sent a monthly summary for this result, not daily values, so there is no control chart for this month.'
              : 'There is no target for this choice yet (no figures to compare with).'}
          </Unavailable>
        ) : (
          <>
            <p className="text-sm text-slate-700">
              {lj.runs.length} runs: {lj.runs.length - rejected.length - warned.length} accepted,{' '}
              {warned.length} with a warning,{' '}
              <span className={rejected.length > 0 ? 'font-semibold text-alarm-800' : undefined}>
                {rejected.length} rejected
              </span>
              {rejected.length > 0
                ? ` (${rejected.map((run) => `run ${run.run}: ${run.rules.join(', ')}`).join('; ')})`
                : ''}
              .
            </p>
            <LeveyJenningsChart
              points={ljPoints}
              target={{ mean: lj.target.mean, sd: lj.target.sd }}
              targetLabel={targetBasisWords[lj.target.basis]}
              unit={drilldown.unit}
              decimals={drilldown.decimals}
              level={drilldown.level}
              events={events}
              title={`Levey-Jennings chart, level ${drilldown.level}, ${formatPeriod(drilldown.period)}`}
            />
          </>
        )}
      </Section>

      <Section title="Measurement uncertainty">
        {drilldown.uncertainty ? (
          <>
            <p className="text-sm text-slate-700">
              Expanded uncertainty{' '}
              <span className="font-semibold">U = {drilldown.uncertainty.U.toFixed(2)} %</span> (k ={' '}
              {drilldown.uncertainty.k}) from your long-term CV of{' '}
              {drilldown.uncertainty.longTerm.cv.toFixed(2)} % and your bias against the peer groups over{' '}
              {drilldown.uncertainty.comparisons.length} month
              {drilldown.uncertainty.comparisons.length === 1 ? '' : 's'} (Nordtest approach).
            </p>
            <UncertaintyChart components={uncertaintyComponents(drilldown.uncertainty)} />
          </>
        ) : (
          <Unavailable>
            {drilldown.uncertaintyNote ?? 'Not enough data to estimate the measurement uncertainty.'}
          </Unavailable>
        )}
      </Section>
    </div>
  );
}
