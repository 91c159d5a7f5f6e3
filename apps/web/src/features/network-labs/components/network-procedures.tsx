// Which labs run which analyte on which instrument model, method and reagent, and which of those
// procedures cannot be peered: no tier (instrument, method, analyte) has enough labs. Server-side
// filters and paging; the options of the filters are handed in by the page.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import type { NetworkProcedure } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { Pagination } from '../../../components/ui/pagination.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatCount } from '../../../utils/format.ts';
import {
  networkLabsKeys,
  PROCEDURES_PAGE_SIZE,
  type NetworkProceduresParams,
} from '../api/network-labs-keys.ts';

export type FilterOption = { id: string; label: string };
export type ProcedureFilterOptions = {
  labs: FilterOption[];
  analytes: FilterOption[];
  instrumentModels: FilterOption[];
  methods: FilterOption[];
};

/** The default of docs/methods.md: a tier's figures are published from 3 labs on. */
const DEFAULT_MIN_LABS = 3;

/** A catalogue entry by its code; the name is a hover away (and read out to screen readers). */
function Ref({ code, name }: { code: string; name: string }) {
  return (
    <span title={name} className="whitespace-nowrap">
      {code}
      <span className="sr-only"> ({name})</span>
    </span>
  );
}

function TierCount({ tier, label }: { tier: { labs: number; enough: boolean }; label: string }) {
  return (
    <span
      className={`inline-flex min-w-10 justify-end gap-1 ${tier.enough ? 'text-plumb-800' : 'text-slate-400'}`}
      title={`${tier.labs} labs at the ${label}: ${tier.enough ? 'enough' : 'too few'}`}
    >
      <span className="sr-only">{label}: </span>
      {tier.labs}
      <span aria-hidden="true" className="w-2.5 text-left">
        {tier.enough ? '✓' : '·'}
      </span>
      <span className="sr-only">{tier.enough ? '(enough)' : '(too few)'}</span>
    </span>
  );
}

function PeerStatus({ procedure }: { procedure: NetworkProcedure }) {
  const { peerable } = procedure;
  if (procedure.unpeerable) return <Badge tone="alarm">No peer group</Badge>;
  if (peerable.instrument.enough) return <Badge tone="plumb">Instrument tier</Badge>;
  if (peerable.method.enough) return <Badge tone="plumb">Method tier</Badge>;
  return <Badge tone="brass">Analyte tier only</Badge>;
}

const column = createColumnHelper<NetworkProcedure>();
const columns = [
  column.accessor((p) => p.lab.code, {
    id: 'lab',
    header: 'Lab',
    cell: (c) => (
      <span className="block">
        <span className="font-semibold text-plumb-900">{c.getValue()}</span>
        {!c.row.original.lab.active ? <span className="ml-1 text-xs text-slate-500">(inactive)</span> : null}
        <span className="block max-w-[10rem] truncate text-xs text-slate-600" title={c.row.original.lab.name}>
          {c.row.original.lab.name}
        </span>
      </span>
    ),
  }),
  column.accessor('code', {
    header: 'Procedure',
    cell: (c) => (
      <span className="block whitespace-nowrap">
        {c.getValue()}
        <span className="block font-mono text-xs text-slate-500">{c.row.original.unit}</span>
      </span>
    ),
  }),
  column.accessor((p) => p.analyte.code, {
    id: 'analyte',
    header: 'Analyte',
    cell: (c) => (
      <span className="block">
        <span className="font-medium text-slate-900">{c.row.original.analyte.code}</span>
        <span
          className="block max-w-[8rem] truncate text-xs text-slate-600"
          title={c.row.original.analyte.name}
        >
          {c.row.original.analyte.name}
        </span>
      </span>
    ),
  }),
  column.display({
    id: 'key',
    header: 'Instrument model · method · reagent',
    cell: (c) => {
      const p = c.row.original;
      return (
        <span className="whitespace-nowrap">
          <Ref {...p.instrumentModel} />
          <span aria-hidden="true" className="px-1.5 text-slate-300">
            ·
          </span>
          <Ref {...p.method} />
          <span aria-hidden="true" className="px-1.5 text-slate-300">
            ·
          </span>
          <Ref {...p.reagent} />
        </span>
      );
    },
  }),
  column.display({
    id: 'tiers',
    header: () => (
      <span className="grid grid-cols-[3.25rem_3.25rem_3.25rem] gap-x-1 text-right">
        <abbr title="Labs sharing analyte, instrument model, method and reagent">Instr.</abbr>
        <abbr title="Labs sharing analyte and method">Method</abbr>
        <abbr title="Labs measuring the analyte">Analyte</abbr>
      </span>
    ),
    meta: { align: 'right' },
    cell: (c) => {
      const { peerable } = c.row.original;
      return (
        <span className="grid grid-cols-[3.25rem_3.25rem_3.25rem] gap-x-1">
          <TierCount tier={peerable.instrument} label="instrument tier" />
          <TierCount tier={peerable.method} label="method tier" />
          <TierCount tier={peerable.analyte} label="analyte tier" />
        </span>
      );
    },
  }),
  column.display({
    id: 'status',
    header: 'Peered at',
    cell: (c) => <PeerStatus procedure={c.row.original} />,
  }),
];

function FilterSelect({
  id,
  label,
  value,
  options,
  onChange,
}: {
  id: string;
  label: string;
  value: string;
  options: FilterOption[];
  onChange: (value: string) => void;
}) {
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-xs font-medium text-slate-700">
        {label}
      </label>
      <select
        id={id}
        value={value}
        onChange={(event) => onChange(event.target.value)}
        className="h-9 max-w-[14rem] rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs hover:border-slate-400"
      >
        <option value="">All</option>
        {options.map((option) => (
          <option key={option.id} value={option.id}>
            {option.label}
          </option>
        ))}
      </select>
    </div>
  );
}

type Filters = {
  labId: string;
  analyteId: string;
  instrumentModelId: string;
  methodId: string;
  unpeerableOnly: boolean;
  minLabs: number;
};

export function NetworkProcedures({ options }: { options: ProcedureFilterOptions }) {
  const [filters, setFilters] = useState<Filters>({
    labId: '',
    analyteId: '',
    instrumentModelId: '',
    methodId: '',
    unpeerableOnly: false,
    minLabs: DEFAULT_MIN_LABS,
  });
  const [offset, setOffset] = useState(0);
  const setFilter = <K extends keyof Filters>(key: K, value: Filters[K]) => {
    setFilters((current) => ({ ...current, [key]: value }));
    setOffset(0);
  };

  const common: NetworkProceduresParams = {
    labId: filters.labId || undefined,
    analyteId: filters.analyteId || undefined,
    instrumentModelId: filters.instrumentModelId || undefined,
    methodId: filters.methodId || undefined,
    minLabs: filters.minLabs,
  };
  const page = useQuery(
    networkLabsKeys.procedures({
      ...common,
      unpeerable: filters.unpeerableOnly ? true : undefined,
      limit: PROCEDURES_PAGE_SIZE,
      offset,
    }),
  );
  // How many of the matching procedures have no peer group, whatever the page shows.
  const unpeerable = useQuery(
    networkLabsKeys.procedures({ ...common, unpeerable: true, limit: 1, offset: 0 }),
  );

  const table = useReactTable({
    data: page.data?.items ?? [],
    columns,
    // The API lists procedures by lab and analyte and takes no sort; sorting one page would mislead.
    enableSorting: false,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (p) => p.id,
  });

  return (
    <div>
      <div className="mb-4 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white px-4 py-3 shadow-xs">
        <FilterSelect
          id="procedures-lab"
          label="Lab"
          value={filters.labId}
          options={options.labs}
          onChange={(v) => setFilter('labId', v)}
        />
        <FilterSelect
          id="procedures-analyte"
          label="Analyte"
          value={filters.analyteId}
          options={options.analytes}
          onChange={(v) => setFilter('analyteId', v)}
        />
        <FilterSelect
          id="procedures-instrument"
          label="Instrument model"
          value={filters.instrumentModelId}
          options={options.instrumentModels}
          onChange={(v) => setFilter('instrumentModelId', v)}
        />
        <FilterSelect
          id="procedures-method"
          label="Method"
          value={filters.methodId}
          options={options.methods}
          onChange={(v) => setFilter('methodId', v)}
        />
        <div className="flex flex-col gap-1">
          <label htmlFor="procedures-min-labs" className="text-xs font-medium text-slate-700">
            Labs a tier needs
          </label>
          <input
            id="procedures-min-labs"
            type="number"
            min={1}
            max={100}
            value={filters.minLabs}
            onChange={(event) => {
              const value = Number(event.target.value);
              if (Number.isInteger(value) && value >= 1 && value <= 100) setFilter('minLabs', value);
            }}
            className="h-9 w-20 rounded-md border border-slate-300 bg-white px-2 text-right text-sm shadow-xs"
          />
        </div>
        <label className="flex h-9 items-center gap-2 text-sm text-slate-700">
          <input
            type="checkbox"
            checked={filters.unpeerableOnly}
            onChange={(event) => setFilter('unpeerableOnly', event.target.checked)}
          />
          Only procedures without a peer group
        </label>
      </div>

      <p className="mb-3 text-sm text-slate-700" aria-live="polite">
        {page.data ? (
          <>
            <span className="font-semibold text-slate-900">{formatCount(page.data.total)}</span>{' '}
            {filters.unpeerableOnly ? 'procedures without a peer group' : 'procedures'}
            {unpeerable.data && !filters.unpeerableOnly ? (
              <>
                {' '}
                ·{' '}
                <span className={unpeerable.data.total > 0 ? 'font-semibold text-alarm-800' : undefined}>
                  {formatCount(unpeerable.data.total)}
                </span>{' '}
                cannot be peered at any tier (fewer than {page.data.minLabs} labs)
              </>
            ) : null}
          </>
        ) : null}
      </p>

      {page.isError ? (
        <Alert tone="error" title="The procedures could not be loaded">
          {errorMessage(page.error)}
        </Alert>
      ) : (
        <>
          <DataTable
            table={table}
            caption="Measurement procedures across the network"
            emptyMessage={
              page.isPending
                ? 'Loading…'
                : filters.unpeerableOnly
                  ? 'Every matching procedure has a peer group at some tier.'
                  : 'No procedure matches these filters.'
            }
            isFetching={page.isPlaceholderData}
            rowClassName={(p) => (p.unpeerable ? 'bg-alarm-50/50' : '')}
          />
          <Pagination
            label="Procedure pages"
            total={page.data?.total ?? 0}
            limit={PROCEDURES_PAGE_SIZE}
            offset={offset}
            onOffsetChange={setOffset}
          />
        </>
      )}
    </div>
  );
}
