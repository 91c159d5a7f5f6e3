// The monthly periods, newest first: state, submission deadline, what can be done with each.
import { useState } from 'react';
import { Link } from 'react-router-dom';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { Period } from '@plumbline/contracts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { paths } from '../../../config/paths.ts';
import { formatDateTime, formatPeriod } from '../../../utils/format.ts';
import { PeriodPublication } from './period-publication.tsx';
import { PeriodStateBadge } from './period-state-badge.tsx';

export type PeriodRowActions = {
  onChangeDeadline: (period: Period) => void;
  onTransition: (period: Period, action: 'close' | 'reopen') => void;
};

const column = createColumnHelper<Period>();

function Deadline({ period, now }: { period: Period; now: Date }) {
  const passed = new Date(period.deadline).getTime() < now.getTime();
  return (
    <span className="flex flex-wrap items-center gap-2">
      <time dateTime={period.deadline} className="whitespace-nowrap">
        {formatDateTime(period.deadline)}
      </time>
      {period.state === 'open' && passed ? <Badge tone="brass">Passed, not closed</Badge> : null}
    </span>
  );
}

export function PeriodsTable({ periods, actions }: { periods: Period[]; actions: PeriodRowActions }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'period', desc: true }]);
  const [now] = useState(() => new Date());
  const columns = [
    column.accessor('period', {
      header: 'Period',
      cell: (c) => (
        <span className="block">
          <span className="font-semibold text-plumb-900">{formatPeriod(c.getValue())}</span>
          <span className="block font-mono text-xs text-slate-500">{c.getValue()}</span>
        </span>
      ),
    }),
    column.accessor('state', { header: 'State', cell: (c) => <PeriodStateBadge state={c.getValue()} /> }),
    column.accessor('deadline', {
      header: 'Submission deadline',
      cell: (c) => <Deadline period={c.row.original} now={now} />,
    }),
    column.display({
      id: 'participation',
      header: 'Participation',
      cell: (c) => (
        <Link
          to={paths.network.participation.getHref(c.row.original.period)}
          className="text-sm font-medium whitespace-nowrap text-plumb-700 underline underline-offset-4 hover:text-plumb-900"
        >
          Board<span className="sr-only"> for {formatPeriod(c.row.original.period)}</span>
        </Link>
      ),
    }),
    column.display({
      id: 'publication',
      header: 'Publication',
      cell: (c) => <PeriodPublication period={c.row.original} />,
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      meta: { align: 'right' },
      cell: (c) => {
        const period = c.row.original;
        const name = formatPeriod(period.period);
        return (
          <div className="flex justify-end gap-1">
            {period.state !== 'published' ? (
              <Button
                variant="ghost"
                size="xs"
                onClick={() => actions.onChangeDeadline(period)}
                aria-label={`Change the deadline of ${name}`}
              >
                Deadline
              </Button>
            ) : null}
            {period.state === 'open' ? (
              <Button
                variant="ghost"
                size="xs"
                onClick={() => actions.onTransition(period, 'close')}
                aria-label={`Close ${name}`}
              >
                Close
              </Button>
            ) : null}
            {period.state === 'closed' ? (
              <Button
                variant="ghost"
                size="xs"
                onClick={() => actions.onTransition(period, 'reopen')}
                aria-label={`Reopen ${name}`}
              >
                Reopen
              </Button>
            ) : null}
          </div>
        );
      },
    }),
  ];
  const table = useReactTable({
    data: periods,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (p) => p.period,
  });
  return (
    <DataTable
      table={table}
      caption="Monthly periods"
      emptyMessage="No period exists yet. Create the first one to let labs submit data."
    />
  );
}
