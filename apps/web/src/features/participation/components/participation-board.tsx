// Who has submitted what for one period: totals, then one row per lab with its registered and
// submitted procedures, what is missing, what came late, and action-level flags. Every lab is on
// one page, so sorting and filtering happen in the browser.
import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { ParticipationBoard as Board, ParticipationFlag, ParticipationLab } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatCount, formatDateTime } from '../../../utils/format.ts';
import { participationKeys } from '../api/participation-keys.ts';

type Status = ParticipationLab['status'];
const statusLabels: Record<Status, string> = {
  complete: 'Complete',
  partial: 'Partial',
  none: 'Nothing yet',
};
const statusTones = { complete: 'solid', partial: 'brass', none: 'alarm' } as const;
const statusOrder: Record<Status, number> = { none: 0, partial: 1, complete: 2 };

const flagLabels: Record<ParticipationFlag['kind'], string> = {
  sdi: '|SDI| > 3',
  cvr: 'CVR > 2',
  'excluded-outlier': 'Excluded as outlier',
  'not-computable': 'Cannot be computed',
};

function FlagSummary({ flags }: { flags: ParticipationFlag[] }) {
  if (flags.length === 0) return <span className="text-slate-400">0</span>;
  const byKind = new Map<ParticipationFlag['kind'], number>();
  for (const flag of flags) byKind.set(flag.kind, (byKind.get(flag.kind) ?? 0) + 1);
  return (
    <span className="flex flex-wrap justify-end gap-1">
      {[...byKind].map(([kind, count]) => (
        <Badge key={kind} tone="alarm">
          {count} × {flagLabels[kind]}
        </Badge>
      ))}
    </span>
  );
}

function Submitted({ lab }: { lab: ParticipationLab }) {
  const share = lab.proceduresRegistered === 0 ? 0 : lab.proceduresWithData / lab.proceduresRegistered;
  return (
    <span className="flex items-center justify-end gap-2">
      <span className="whitespace-nowrap">
        {lab.proceduresWithData} / {lab.proceduresRegistered}
      </span>
      <span aria-hidden="true" className="h-1.5 w-14 overflow-hidden rounded-full bg-slate-100">
        <span
          className="block h-full rounded-full bg-plumb-600"
          style={{ width: `${Math.round(share * 100)}%` }}
        />
      </span>
    </span>
  );
}

function LabDetail({ lab }: { lab: ParticipationLab }) {
  return (
    <div className="grid gap-4 text-sm md:grid-cols-2">
      <div>
        <p className="font-semibold text-slate-800">Missing procedures ({lab.missing.length})</p>
        {lab.missing.length === 0 ? (
          <p className="text-slate-600">None: every registered procedure has data.</p>
        ) : (
          <ul className="mt-1 grid grid-cols-[auto_1fr] gap-x-3 gap-y-0.5">
            {lab.missing.map((procedure) => (
              <li key={procedure.procedureId} className="contents">
                <span className="font-medium text-slate-900">{procedure.code}</span>
                <span className="text-slate-600">
                  {procedure.analyte.code} · {procedure.analyte.name}
                </span>
              </li>
            ))}
          </ul>
        )}
      </div>
      <div>
        <p className="font-semibold text-slate-800">Action-level flags ({lab.flags.length})</p>
        {lab.flags.length === 0 ? (
          <p className="text-slate-600">None.</p>
        ) : (
          <ul className="mt-1 space-y-0.5">
            {lab.flags.map((flag, index) => (
              <li key={index}>
                {flagLabels[flag.kind]}
                {flag.value !== null ? <span className="figures"> ({flag.value.toFixed(2)})</span> : null},
                level {flag.level}
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}

const column = createColumnHelper<ParticipationLab>();

function Totals({ board }: { board: Board }) {
  const tiles = [
    { label: 'Labs', value: board.totals.labs, tone: 'text-plumb-950' },
    { label: 'Complete', value: board.totals.complete, tone: 'text-plumb-800' },
    { label: 'Partial', value: board.totals.partial, tone: 'text-brass-700' },
    {
      label: 'Nothing yet',
      value: board.totals.none,
      tone: board.totals.none > 0 ? 'text-alarm-800' : 'text-slate-700',
    },
    { label: 'With late data', value: board.totals.late, tone: 'text-slate-800' },
  ];
  return (
    <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5">
      {tiles.map((tile) => (
        <div key={tile.label} className="rounded-lg border border-slate-200 bg-white px-4 py-3 shadow-xs">
          <dt className="text-xs text-slate-600">{tile.label}</dt>
          <dd className={`figures mt-0.5 text-2xl font-semibold ${tile.tone}`}>{formatCount(tile.value)}</dd>
        </div>
      ))}
    </dl>
  );
}

export function ParticipationBoard({ period }: { period: string }) {
  const board = useQuery(participationKeys.board(period));
  const [sorting, setSorting] = useState<SortingState>([{ id: 'code', desc: false }]);
  const [search, setSearch] = useState('');
  const [status, setStatus] = useState<Status | ''>('');
  const [lateOnly, setLateOnly] = useState(false);
  const [flaggedOnly, setFlaggedOnly] = useState(false);
  const [expanded, setExpanded] = useState<Set<string>>(new Set());

  const rows = useMemo(
    () =>
      (board.data?.labs ?? []).filter(
        (lab) =>
          (status === '' || lab.status === status) &&
          (!lateOnly || lab.lateCount > 0) &&
          (!flaggedOnly || lab.flags.length > 0),
      ),
    [board.data, status, lateOnly, flaggedOnly],
  );

  const toggle = (labId: string) =>
    setExpanded((current) => {
      const next = new Set(current);
      if (next.has(labId)) next.delete(labId);
      else next.add(labId);
      return next;
    });

  const columns = [
    column.accessor((lab) => lab.lab.code, {
      id: 'code',
      header: 'Lab',
      cell: (c) => {
        const { lab } = c.row.original;
        return (
          <span className="block">
            <span className="font-semibold text-plumb-900">{lab.code}</span>
            {!lab.active ? <span className="ml-1 text-xs text-slate-500">(inactive)</span> : null}
            <span className="block text-xs text-slate-600">{lab.name}</span>
          </span>
        );
      },
    }),
    column.accessor((lab) => statusOrder[lab.status], {
      id: 'status',
      header: 'Status',
      cell: (c) => (
        <Badge tone={statusTones[c.row.original.status]}>{statusLabels[c.row.original.status]}</Badge>
      ),
    }),
    column.accessor('proceduresWithData', {
      header: 'Submitted',
      meta: { align: 'right' },
      cell: (c) => <Submitted lab={c.row.original} />,
    }),
    column.accessor((lab) => lab.missing.length, {
      id: 'missing',
      header: 'Missing',
      meta: { align: 'right' },
      cell: (c) => (
        <span className={c.getValue() > 0 ? 'font-semibold text-alarm-800' : 'text-slate-400'}>
          {c.getValue()}
        </span>
      ),
    }),
    column.accessor('lateCount', {
      header: 'Late',
      meta: { align: 'right' },
      cell: (c) => (
        <span className={c.getValue() > 0 ? 'font-semibold text-brass-700' : 'text-slate-400'}>
          {c.getValue()}
        </span>
      ),
    }),
    column.accessor((lab) => lab.flags.length, {
      id: 'flags',
      header: 'Flags',
      meta: { align: 'right' },
      cell: (c) => <FlagSummary flags={c.row.original.flags} />,
    }),
    column.display({
      id: 'detail',
      header: () => <span className="sr-only">Details</span>,
      meta: { align: 'right' },
      cell: (c) => {
        const { lab } = c.row.original;
        const open = expanded.has(lab.id);
        return (
          <Button variant="ghost" size="xs" aria-expanded={open} onClick={() => toggle(lab.id)}>
            {open ? 'Hide' : 'Details'}
            <span className="sr-only"> of {lab.code}</span>
          </Button>
        );
      },
    }),
  ];

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, globalFilter: search },
    onSortingChange: setSorting,
    onGlobalFilterChange: setSearch,
    globalFilterFn: (row, _id, value: string) => {
      const needle = value.trim().toLowerCase();
      return !needle || `${row.original.lab.code} ${row.original.lab.name}`.toLowerCase().includes(needle);
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getRowId: (lab) => lab.lab.id,
  });

  if (board.isPending) return <PageLoading />;
  if (board.isError) {
    return (
      <Alert tone="error" title="The participation board could not be loaded">
        {errorMessage(board.error)}
      </Alert>
    );
  }
  const data = board.data;
  const anyFlags = data.labs.some((lab) => lab.flags.length > 0);
  const filtered = search !== '' || status !== '' || lateOnly || flaggedOnly;

  return (
    <div className="space-y-5">
      <p className="text-sm text-slate-700">
        Deadline <time dateTime={data.period.deadline}>{formatDateTime(data.period.deadline)}</time>
        {data.period.closedAt ? (
          <>
            {' '}
            · closed <time dateTime={data.period.closedAt}>{formatDateTime(data.period.closedAt)}</time>; data
            arriving since is marked late
          </>
        ) : null}
        {data.period.publishedAt ? (
          <>
            {' '}
            · published{' '}
            <time dateTime={data.period.publishedAt}>{formatDateTime(data.period.publishedAt)}</time>
          </>
        ) : null}
        .
      </p>
      <Totals board={data} />

      <div className="flex flex-wrap items-end gap-4">
        <div className="flex flex-col gap-1">
          <label htmlFor="participation-search" className="text-xs font-medium text-slate-700">
            Find a lab
          </label>
          <input
            id="participation-search"
            type="search"
            value={search}
            onChange={(event) => setSearch(event.target.value)}
            placeholder="Code or name"
            className="h-9 w-52 rounded-md border border-slate-300 bg-white px-3 text-sm shadow-xs placeholder:text-slate-400 hover:border-slate-400"
          />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="participation-status" className="text-xs font-medium text-slate-700">
            Status
          </label>
          <select
            id="participation-status"
            value={status}
            onChange={(event) => setStatus(event.target.value as Status | '')}
            className="h-9 rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs hover:border-slate-400"
          >
            <option value="">All</option>
            <option value="none">Nothing yet</option>
            <option value="partial">Partial</option>
            <option value="complete">Complete</option>
          </select>
        </div>
        <label className="flex h-9 items-center gap-2 text-sm text-slate-700">
          <input type="checkbox" checked={lateOnly} onChange={(event) => setLateOnly(event.target.checked)} />
          With late data
        </label>
        <label className="flex h-9 items-center gap-2 text-sm text-slate-700">
          <input
            type="checkbox"
            checked={flaggedOnly}
            onChange={(event) => setFlaggedOnly(event.target.checked)}
          />
          With action-level flags
        </label>
      </div>

      <DataTable
        table={table}
        caption={`Participation of each lab`}
        emptyMessage={filtered ? 'No lab matches these filters.' : 'No active lab is enrolled.'}
        rowClassName={(lab) => (lab.status === 'none' ? 'bg-alarm-50/40' : '')}
        renderDetail={(lab) => (expanded.has(lab.lab.id) ? <LabDetail lab={lab} /> : null)}
      />
      {!anyFlags ? (
        <p className="text-xs text-slate-600">
          Action-level flags (|SDI| &gt; 3, CVR &gt; 2, a lab excluded as an outlier) are listed once the
          period&rsquo;s peer statistics are computed; none are recorded for this period.
        </p>
      ) : null}
    </div>
  );
}
