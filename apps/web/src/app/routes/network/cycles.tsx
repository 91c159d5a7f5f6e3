// Monthly cycles: create periods, set their submission deadline, close and reopen them. Publishing
// comes with frozen peer statistics (see PeriodPublication).
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { cyclesKeys } from '../../../features/cycles/api/cycles-keys.ts';
import {
  PeriodFormDialog,
  type PeriodFormState,
} from '../../../features/cycles/components/period-form-dialog.tsx';
import {
  PeriodTransitionDialog,
  type PeriodTransition,
} from '../../../features/cycles/components/period-transition-dialog.tsx';
import { PeriodsTable } from '../../../features/cycles/components/periods-table.tsx';
import { RecomputeFailuresNotice } from '../../../features/peer-groups/components/recompute-failures-notice.tsx';
import { nextPeriod, periodOf } from '../../../features/cycles/utils/period-dates.ts';
import { errorMessage } from '../../../lib/form-errors.ts';

const lifeCycle = [
  { state: 'Open', text: 'Labs submit the month’s QC data until the deadline.' },
  { state: 'Closed', text: 'Data still arrives but is marked late; reopen with a reason if needed.' },
  { state: 'Published', text: 'Peer statistics are frozen as a versioned report for every lab.' },
];

export default function CyclesRoute() {
  const periods = useQuery(cyclesKeys.periods());
  const [form, setForm] = useState<PeriodFormState>(null);
  const [transition, setTransition] = useState<PeriodTransition>(null);

  const latest = periods.data?.reduce<string | null>(
    (max, p) => (max === null || p.period > max ? p.period : max),
    null,
  );
  const suggested = latest ? nextPeriod(latest) : periodOf(new Date());

  return (
    <ContentLayout
      title="Cycles"
      area="Network"
      description="The network's monthly cycles: when labs submit, when a month closes, and when its reports are published."
      actions={<Button onClick={() => setForm({ mode: 'create', suggested })}>Create a period</Button>}
    >
      <ol className="mb-6 grid gap-3 sm:grid-cols-3">
        {lifeCycle.map((step, index) => (
          <li
            key={step.state}
            className="flex gap-3 rounded-lg border border-slate-200 bg-white px-4 py-3 text-sm shadow-xs"
          >
            <span className="figures flex size-6 shrink-0 items-center justify-center rounded-full bg-plumb-100 text-xs font-semibold text-plumb-800">
              {index + 1}
            </span>
            <span>
              <span className="font-semibold text-plumb-900">{step.state}</span>
              <span className="block text-slate-600">{step.text}</span>
            </span>
          </li>
        ))}
      </ol>

      {/* Publishing freezes the figures: groups that could not be computed are shown before. */}
      <RecomputeFailuresNotice />

      {periods.isPending ? (
        <PageLoading />
      ) : periods.isError ? (
        <Alert tone="error" title="The periods could not be loaded">
          {errorMessage(periods.error)}
        </Alert>
      ) : (
        <PeriodsTable
          periods={periods.data}
          actions={{
            onChangeDeadline: (period) => setForm({ mode: 'deadline', period }),
            onTransition: (period, action) => setTransition({ period, action }),
          }}
        />
      )}
      <PeriodFormDialog state={form} onClose={() => setForm(null)} />
      <PeriodTransitionDialog request={transition} onClose={() => setTransition(null)} />
    </ContentLayout>
  );
}
