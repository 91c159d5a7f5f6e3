// The participation board of one period (?period=YYYY-MM); the periods come from the cycles feature.
import { useSearchParams } from 'react-router-dom';
import { useQuery } from '@tanstack/react-query';
import type { Period } from '@plumbline/contracts';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { cyclesKeys } from '../../../features/cycles/api/cycles-keys.ts';
import { PeriodStateBadge } from '../../../features/cycles/components/period-state-badge.tsx';
import { periodOf } from '../../../features/cycles/utils/period-dates.ts';
import { ParticipationBoard } from '../../../features/participation/components/participation-board.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';

/** The latest month that has ended: the one whose submissions are being chased. */
function defaultPeriod(periods: Period[], today: Date): string | null {
  const current = periodOf(today);
  const sorted = [...periods].sort((a, b) => b.period.localeCompare(a.period));
  return sorted.find((p) => p.period < current)?.period ?? sorted[0]?.period ?? null;
}

export default function ParticipationRoute() {
  const periods = useQuery(cyclesKeys.periods());
  const [searchParams, setSearchParams] = useSearchParams();
  const requested = searchParams.get('period');
  const list = periods.data ?? [];
  const period = list.some((p) => p.period === requested) ? requested : defaultPeriod(list, new Date());
  const current = list.find((p) => p.period === period);

  return (
    <ContentLayout
      title="Participation"
      area="Network"
      description="Which labs have submitted which procedures for a period, which are late or missing, and which carry action-level flags."
      actions={
        list.length > 0 ? (
          <div className="flex items-end gap-3">
            {current ? <PeriodStateBadge state={current.state} /> : null}
            <div className="flex flex-col gap-1">
              <label htmlFor="participation-period" className="text-xs font-medium text-slate-700">
                Period
              </label>
              <select
                id="participation-period"
                value={period ?? ''}
                onChange={(event) => setSearchParams({ period: event.target.value }, { replace: true })}
                className="h-10 rounded-md border border-slate-300 bg-white px-2.5 text-[0.95rem] shadow-xs hover:border-slate-400"
              >
                {[...list]
                  .sort((a, b) => b.period.localeCompare(a.period))
                  .map((p) => (
                    <option key={p.period} value={p.period}>
                      {formatPeriod(p.period)}
                    </option>
                  ))}
              </select>
            </div>
          </div>
        ) : null
      }
    >
      {periods.isPending ? (
        <PageLoading />
      ) : periods.isError ? (
        <Alert tone="error" title="The periods could not be loaded">
          {errorMessage(periods.error)}
        </Alert>
      ) : period ? (
        <ParticipationBoard key={period} period={period} />
      ) : (
        <EmptyState
          title="No period exists yet"
          description="Create a period under Cycles; its participation board then shows here."
        />
      )}
    </ContentLayout>
  );
}
