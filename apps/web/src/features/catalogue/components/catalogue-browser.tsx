// One catalogue list: search, state filter, server-side sorting and paging, and the actions
// (new entry, CSV import, edit, retire/restore). The list itself is chosen by the page.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { getCoreRowModel, useReactTable, type SortingState } from '@tanstack/react-table';
import { catalogueSortColumns, type CatalogueList, type CatalogueListQuery } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { Pagination } from '../../../components/ui/pagination.tsx';
import { useDebouncedValue } from '../../../hooks/use-debounced-value.ts';
import { errorMessage } from '../../../lib/form-errors.ts';
import { CATALOGUE_PAGE_SIZE, catalogueKeys, type CatalogueItem } from '../api/catalogue-keys.ts';
import { catalogueListLabels } from '../utils/list-labels.ts';
import { catalogueColumns } from './catalogue-columns.tsx';
import { EntryDialog, type EntryDialogState } from './entry-dialog.tsx';
import { ImportDialog } from './import-dialog.tsx';
import { StateChangeDialog, type StateChangeRequest } from './state-change-dialog.tsx';

type StateFilter = CatalogueListQuery['state'];

export function CatalogueBrowser({ list }: { list: CatalogueList }) {
  const labels = catalogueListLabels[list];
  const [search, setSearch] = useState('');
  const q = useDebouncedValue(search.trim());
  const [state, setState] = useState<StateFilter>('active');
  const [sorting, setSorting] = useState<SortingState>([{ id: catalogueSortColumns[list][0], desc: false }]);
  const [offset, setOffset] = useState(0);
  const [entryDialog, setEntryDialog] = useState<EntryDialogState>(null);
  const [stateChange, setStateChange] = useState<StateChangeRequest>(null);
  const [importing, setImporting] = useState(false);

  const sort = sorting[0];
  const params = {
    q: q || undefined,
    state,
    sort: sort?.id,
    order: sort?.desc ? ('desc' as const) : ('asc' as const),
    limit: CATALOGUE_PAGE_SIZE,
    offset,
  };
  const page = useQuery(catalogueKeys.list(list, params));

  const table = useReactTable<CatalogueItem>({
    data: page.data?.items ?? [],
    columns: catalogueColumns(list, {
      onEdit: (entry) => setEntryDialog({ mode: 'edit', entry }),
      onStateChange: (entry, action) => setStateChange({ entry, action }),
    }),
    state: { sorting },
    onSortingChange: (updater) => {
      setSorting(updater);
      setOffset(0);
    },
    manualSorting: true,
    enableSortingRemoval: false,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (row) => row.id,
  });

  const filtered = q !== '' || state !== 'all';
  const emptyMessage = page.isPending
    ? 'Loading…'
    : filtered
      ? `No ${labels.title.toLowerCase()} match ${q ? `“${q}”` : 'this filter'}${state !== 'all' ? ` among the ${state} ones` : ''}.`
      : `No ${labels.title.toLowerCase()} yet. Create the first one or import a CSV file.`;

  return (
    <section aria-labelledby="catalogue-list-title" className="min-w-0">
      <div className="flex flex-col gap-3 lg:flex-row lg:items-start lg:justify-between">
        <div>
          <h2 id="catalogue-list-title" className="text-lg font-semibold text-plumb-950">
            {labels.title}
          </h2>
          <p className="mt-0.5 max-w-2xl text-sm text-slate-600">{labels.description}</p>
        </div>
        <div className="flex shrink-0 gap-2">
          <Button variant="secondary" onClick={() => setImporting(true)}>
            Import CSV
          </Button>
          <Button onClick={() => setEntryDialog({ mode: 'create' })}>New {labels.singular}</Button>
        </div>
      </div>

      <div className="mt-4 mb-3 flex flex-wrap items-end gap-3">
        <div className="flex flex-col gap-1">
          <label htmlFor="catalogue-search" className="text-xs font-medium text-slate-700">
            Search
          </label>
          <input
            id="catalogue-search"
            type="search"
            value={search}
            onChange={(event) => {
              setSearch(event.target.value);
              setOffset(0);
            }}
            placeholder={
              list === 'control-lots'
                ? 'Lot number or material'
                : list === 'analytes'
                  ? 'Code, name or LOINC'
                  : 'Code or name'
            }
            className="h-9 w-64 rounded-md border border-slate-300 bg-white px-3 text-sm shadow-xs placeholder:text-slate-400 hover:border-slate-400"
          />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="catalogue-state" className="text-xs font-medium text-slate-700">
            Show
          </label>
          <select
            id="catalogue-state"
            value={state}
            onChange={(event) => {
              setState(event.target.value as StateFilter);
              setOffset(0);
            }}
            className="h-9 rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs hover:border-slate-400"
          >
            <option value="active">In use</option>
            <option value="retired">Retired</option>
            <option value="all">All</option>
          </select>
        </div>
        <p className="ml-auto text-sm text-slate-600" aria-live="polite">
          {page.data
            ? `${page.data.total} ${page.data.total === 1 ? labels.singular : labels.title.toLowerCase()}`
            : ''}
        </p>
      </div>

      {page.isError ? (
        <Alert tone="error" title={`The ${labels.title.toLowerCase()} could not be loaded`}>
          {errorMessage(page.error)}
        </Alert>
      ) : (
        <>
          <DataTable
            table={table}
            caption={labels.title}
            emptyMessage={emptyMessage}
            isFetching={page.isPlaceholderData}
            rowClassName={(row) => (row.retired ? 'text-slate-500' : '')}
          />
          <Pagination
            label={`${labels.title} pages`}
            total={page.data?.total ?? 0}
            limit={CATALOGUE_PAGE_SIZE}
            offset={offset}
            onOffsetChange={setOffset}
          />
        </>
      )}

      <EntryDialog list={list} state={entryDialog} onClose={() => setEntryDialog(null)} />
      <StateChangeDialog list={list} request={stateChange} onClose={() => setStateChange(null)} />
      <ImportDialog list={list} open={importing} onClose={() => setImporting(false)} />
    </section>
  );
}
