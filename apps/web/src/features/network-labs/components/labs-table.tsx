// The member labs, sortable and filterable in the browser (a network has tens of labs, not thousands).
// Opening a lab shows its settings and users beside the table.
import { useMemo, useState } from 'react';
import {
  createColumnHelper,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { LabListItem } from '@plumbline/contracts';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';

export type LabRowActions = {
  selectedLabId: string | null;
  onSelect: (lab: LabListItem) => void;
};

const column = createColumnHelper<LabListItem>();

export function LabsTable({ labs, actions }: { labs: LabListItem[]; actions: LabRowActions }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'code', desc: false }]);
  const [search, setSearch] = useState('');
  const [showInactive, setShowInactive] = useState(true);
  const data = useMemo(() => (showInactive ? labs : labs.filter((lab) => lab.active)), [labs, showInactive]);

  const columns = [
    column.accessor('code', {
      header: 'Code',
      cell: (c) => <span className="font-semibold whitespace-nowrap text-plumb-900">{c.getValue()}</span>,
      meta: { className: 'w-24' },
    }),
    column.accessor('name', { header: 'Name' }),
    column.accessor('active', {
      header: 'State',
      cell: (c) => (c.getValue() ? <Badge tone="plumb">Active</Badge> : <Badge tone="muted">Inactive</Badge>),
    }),
    column.display({
      id: 'actions',
      header: () => <span className="sr-only">Actions</span>,
      meta: { align: 'right' },
      cell: (c) => {
        const lab = c.row.original;
        const selected = actions.selectedLabId === lab.id;
        return (
          <Button
            variant="ghost"
            size="xs"
            aria-pressed={selected}
            aria-label={`Open lab ${lab.code}`}
            className={selected ? 'bg-plumb-100' : ''}
            onClick={() => actions.onSelect(lab)}
          >
            Open
            <span aria-hidden="true">&rarr;</span>
          </Button>
        );
      },
    }),
  ];

  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: search },
    onSortingChange: setSorting,
    onGlobalFilterChange: setSearch,
    globalFilterFn: (row, _columnId, value: string) => {
      const needle = value.trim().toLowerCase();
      return !needle || `${row.original.code} ${row.original.name}`.toLowerCase().includes(needle);
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    getRowId: (lab) => lab.id,
  });

  const inactiveCount = labs.filter((lab) => !lab.active).length;

  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-4">
        <div className="flex flex-col gap-1">
          <label htmlFor="labs-search" className="text-xs font-medium text-slate-700">
            Find a lab
          </label>
          <input
            id="labs-search"
            type="search"
            value={search}
            onChange={(event) => setSearch(event.target.value)}
            placeholder="Code or name"
            className="h-9 w-56 rounded-md border border-slate-300 bg-white px-3 text-sm shadow-xs placeholder:text-slate-400 hover:border-slate-400"
          />
        </div>
        {inactiveCount > 0 ? (
          <label className="flex h-9 items-center gap-2 text-sm text-slate-700">
            <input
              type="checkbox"
              checked={showInactive}
              onChange={(event) => setShowInactive(event.target.checked)}
            />
            Show inactive labs ({inactiveCount})
          </label>
        ) : null}
      </div>
      <DataTable
        table={table}
        caption="Member labs"
        emptyMessage={
          labs.length === 0 ? 'No labs are enrolled yet. Enrol the first one.' : 'No lab matches.'
        }
        rowClassName={(lab) =>
          `${lab.active ? '' : 'text-slate-500'} ${actions.selectedLabId === lab.id ? 'bg-plumb-50/70' : ''}`
        }
      />
    </div>
  );
}
