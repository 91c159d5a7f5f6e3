// The coordinator's lot-to-lot comparisons: choose an analyte and the month after a control lot
// change (kept in the address), then per level see the two lots' peer means, the common shift with
// its 95 % interval and a verdict in words, and the per-lab differences on a small chart.
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import type { LotComparison, LotDifference } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { cyclesKeys } from '../../cycles/api/cycles-keys.ts';
import { lotComparisonsKeys } from '../api/lot-comparisons-keys.ts';
import { LotDifferenceChart } from './lot-difference-chart.tsx';

function formatDifference(d: LotDifference | null, unit: string): string {
  if (!d) return 'too few labs';
  const pct =
    d.differencePct === null
      ? ''
      : ` (${d.differencePct.toFixed(1)} %, ${d.lowPct!.toFixed(1)} to ${d.highPct!.toFixed(1)} %)`;
  return `${d.difference.toFixed(3)} ${unit}, 95 % CI ${d.low.toFixed(3)} to ${d.high.toFixed(3)}${pct}`;
}

function ComparisonCard({ comparison, unit }: { comparison: LotComparison; unit: string }) {
  const { fromLot, toLot } = comparison;
  return (
    <section
      className="space-y-3 rounded-md border border-slate-200 p-4"
      aria-label={`Level ${comparison.level}`}
    >
      <h2 className="flex flex-wrap items-center gap-2 text-base font-semibold text-slate-900">
        Level {comparison.level}: lot {fromLot.lotNumber} → {toLot.lotNumber}
        <Badge tone={comparison.verdict === 'lot-effect' ? 'alarm' : 'plumb'}>
          {comparison.verdict === 'lot-effect'
            ? 'Lot effect'
            : comparison.verdict === 'no-common-shift'
              ? 'No common shift'
              : 'Too few labs'}
        </Badge>
      </h2>
      <p className="text-sm text-slate-800">{comparison.explanation}</p>
      <dl className="grid grid-cols-1 gap-x-6 gap-y-1 text-sm sm:grid-cols-2">
        <dt className="text-slate-600">
          Peer mean, {fromLot.lotNumber} ({formatPeriod(fromLot.period)})
        </dt>
        <dd>
          {fromLot.mean.toFixed(3)} {unit} from {fromLot.labs} labs
        </dd>
        <dt className="text-slate-600">
          Peer mean, {toLot.lotNumber} ({formatPeriod(toLot.period)})
        </dt>
        <dd>
          {toLot.mean.toFixed(3)} {unit} from {toLot.labs} labs
        </dd>
        <dt className="text-slate-600">Shift in the same labs ({comparison.pairedLabs} labs, paired)</dt>
        <dd>{formatDifference(comparison.paired, unit)}</dd>
        <dt className="text-slate-600">Difference of peer means (Welch)</dt>
        <dd>{formatDifference(comparison.welch, unit)}</dd>
        <dt className="text-slate-600">Labs that also changed reagent lot</dt>
        <dd>{comparison.reagentLotChanges}</dd>
        <dt className="text-slate-600">Labs reading higher / lower</dt>
        <dd>
          {comparison.labsHigher} / {comparison.labsLower}
        </dd>
      </dl>
      <LotDifferenceChart comparison={comparison} unit={unit} />
      <p className="text-xs text-slate-600">
        Dots: each lab’s change of monthly mean (new lot − old lot, {unit}); bar: 95 % interval of the common
        shift; dashed line: no change.
      </p>
    </section>
  );
}

export function LotComparisonsView() {
  const [params, setParams] = useSearchParams();
  const analytes = useQuery(lotComparisonsKeys.analytes());
  const periods = useQuery(cyclesKeys.periods());
  const sortedPeriods = [...(periods.data ?? [])].sort((a, b) => b.period.localeCompare(a.period));
  const analyte =
    analytes.data?.items.find((a) => a.id === params.get('analyte')) ?? analytes.data?.items[0] ?? null;
  const period =
    sortedPeriods.find((p) => p.period === params.get('period'))?.period ?? sortedPeriods[0]?.period ?? null;
  const comparisons = useQuery({
    ...lotComparisonsKeys.comparisons({ analyteId: analyte?.id ?? '', period: period ?? '2000-01' }),
    enabled: Boolean(analyte && period),
  });

  if (analytes.isError || periods.isError) {
    return (
      <Alert tone="error" title="The analytes or months could not be loaded">
        {errorMessage(analytes.error ?? periods.error)}
      </Alert>
    );
  }
  if (analytes.isPending || periods.isPending) return <PageLoading />;

  function choose(key: string, value: string) {
    const next = new URLSearchParams(params);
    next.set(key, value);
    setParams(next, { replace: true });
  }

  return (
    <div className="space-y-6">
      <div className="flex flex-wrap gap-4">
        <SelectField
          label="Analyte"
          value={analyte?.id ?? ''}
          onChange={(e) => choose('analyte', e.target.value)}
        >
          {analytes.data.items.map((a) => (
            <option key={a.id} value={a.id}>
              {a.name} ({a.code})
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Month after the lot change"
          value={period ?? ''}
          onChange={(e) => choose('period', e.target.value)}
        >
          {sortedPeriods.map((p) => (
            <option key={p.period} value={p.period}>
              {formatPeriod(p.period)}
            </option>
          ))}
        </SelectField>
      </div>
      {comparisons.isError ? (
        <Alert tone="error" title="The comparison could not be loaded">
          {errorMessage(comparisons.error)}
        </Alert>
      ) : comparisons.isPending ? (
        <PageLoading />
      ) : comparisons.data.comparisons.length === 0 ? (
        <EmptyState
          title="No lot change in this month"
          description={`No lab reported ${comparisons.data.analyteName} on one control lot in ${formatPeriod(comparisons.data.previousPeriod)} and on another in ${formatPeriod(comparisons.data.period)}.`}
        />
      ) : (
        <>
          {comparisons.data.comparisons.map((c) => (
            <ComparisonCard
              key={`${c.level}-${c.fromLot.controlLotId}-${c.toLot.controlLotId}`}
              comparison={c}
              unit={comparisons.data.unit}
            />
          ))}
          <p className="text-sm text-slate-600">{comparisons.data.caution}</p>
        </>
      )}
    </div>
  );
}
