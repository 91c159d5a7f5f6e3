// CSV import of one list in two steps: the API checks the file without storing anything (dry run)
// and every row says whether it creates, updates or has errors; only a file without errors can then
// be applied, in one transaction.
import { useId, useMemo, useState } from 'react';
import {
  createColumnHelper,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import {
  catalogueCsvColumns,
  type CatalogueList,
  type ImportResult,
  type ImportRow,
} from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatCount } from '../../../utils/format.ts';
import { useImportCatalogue } from '../api/import-catalogue.ts';
import { catalogueListLabels } from '../utils/list-labels.ts';

function rowKey(row: ImportRow): string | null {
  const data = row.data ?? {};
  const key = data.code ?? data.lotNumber;
  return typeof key === 'string' ? key : null;
}

function ActionBadge({ row }: { row: ImportRow }) {
  if (row.action === 'error') return <Badge tone="alarm">Error</Badge>;
  if (row.action === 'create') return <Badge tone="solid">New</Badge>;
  if (row.changes && row.changes.length === 0) return <Badge tone="muted">Unchanged</Badge>;
  return <Badge tone="plumb">Update</Badge>;
}

function RowDetail({ row }: { row: ImportRow }) {
  if (row.action === 'error') {
    return (
      <ul className="space-y-0.5 text-alarm-800">
        {(row.errors ?? []).map((error, index) => (
          <li key={index}>
            <span className="font-mono text-xs font-semibold">{error.column}</span>: {error.message}
          </li>
        ))}
      </ul>
    );
  }
  if (row.action === 'update') {
    return row.changes && row.changes.length > 0 ? (
      <span>Changes {row.changes.join(', ')}</span>
    ) : (
      <span className="text-slate-500">Same as stored</span>
    );
  }
  const name = row.data?.name;
  return <span className="text-slate-600">{typeof name === 'string' ? name : 'New entry'}</span>;
}

const column = createColumnHelper<ImportRow>();
const columns = [
  column.accessor('row', { header: 'Line', meta: { align: 'right', className: 'w-16' } }),
  column.accessor('action', { header: 'Result', cell: (c) => <ActionBadge row={c.row.original} /> }),
  column.accessor((row) => rowKey(row) ?? '', {
    id: 'key',
    header: 'Entry',
    cell: (c) => c.getValue() || <span className="text-slate-400">—</span>,
  }),
  column.display({ id: 'detail', header: 'What happens', cell: (c) => <RowDetail row={c.row.original} /> }),
];

function ImportPreview({ result }: { result: ImportResult }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: 'row', desc: false }]);
  const [onlyErrors, setOnlyErrors] = useState(result.rejected > 0);
  const columnFilters = useMemo(() => (onlyErrors ? [{ id: 'action', value: 'error' }] : []), [onlyErrors]);
  const table = useReactTable({
    data: result.rows,
    columns,
    state: { sorting, columnFilters },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  return (
    <div>
      <div className="mb-3 flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-slate-700">
          <span className="font-semibold text-slate-900">{formatCount(result.rows.length)} rows:</span>{' '}
          {formatCount(result.created)} new, {formatCount(result.updated)} updates,{' '}
          <span className={result.rejected > 0 ? 'font-semibold text-alarm-800' : undefined}>
            {formatCount(result.rejected)} with errors
          </span>
        </p>
        {result.rejected > 0 ? (
          <label className="flex items-center gap-2 text-sm text-slate-700">
            <input
              type="checkbox"
              checked={onlyErrors}
              onChange={(event) => setOnlyErrors(event.target.checked)}
            />
            Show only rows with errors
          </label>
        ) : null}
      </div>
      <DataTable
        table={table}
        caption="Rows of the file and what importing them would do"
        emptyMessage="No rows to show."
      />
    </div>
  );
}

export function ImportDialog({
  list,
  open,
  onClose,
}: {
  list: CatalogueList;
  open: boolean;
  onClose: () => void;
}) {
  return (
    <Dialog
      open={open}
      onClose={onClose}
      title={`Import ${catalogueListLabels[list].title.toLowerCase()} from CSV`}
      description="The file is checked first; nothing is stored until you apply it."
      size="xl"
    >
      <ImportSteps list={list} onClose={onClose} />
    </Dialog>
  );
}

function ImportSteps({ list, onClose }: { list: CatalogueList; onClose: () => void }) {
  const fileInputId = useId();
  const blockedId = useId();
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreviewState] = useState<ImportResult | null>(null);
  // Each new report starts with fresh sorting and filtering.
  const [previewVersion, setPreviewVersion] = useState(0);
  const setPreview = (result: ImportResult | null) => {
    setPreviewState(result);
    setPreviewVersion((version) => version + 1);
  };
  const importer = useImportCatalogue(list);
  const columnsOfList = catalogueCsvColumns[list];

  const check = () => {
    if (!file) return;
    importer.mutate({ file, dryRun: true }, { onSuccess: (result) => setPreview(result) });
  };
  const apply = () => {
    if (!file) return;
    importer.mutate(
      { file, dryRun: false },
      {
        onSuccess: (result) => {
          if (!result.applied) {
            // The file changed between check and apply, or the data did: show the new report.
            setPreview(result);
            return;
          }
          showToast(`Imported ${file.name}: ${result.created} new, ${result.updated} updated.`);
          onClose();
        },
      },
    );
  };

  const blocked = preview !== null && preview.rejected > 0;
  const nothingToDo = preview !== null && preview.created === 0 && preview.updated === 0;

  return (
    <div>
      <div className="grid gap-4 md:grid-cols-[1fr_1fr]">
        <div className="flex flex-col gap-1.5">
          <label htmlFor={fileInputId} className="text-sm font-medium text-slate-800">
            CSV file (UTF-8, header in the first row, at most 5 MB)
          </label>
          <input
            id={fileInputId}
            type="file"
            accept=".csv,text/csv"
            onChange={(event) => {
              setFile(event.target.files?.[0] ?? null);
              setPreview(null);
              importer.reset();
            }}
            className="rounded-md border border-slate-300 bg-white text-sm file:mr-3 file:h-10 file:border-0 file:bg-plumb-50 file:px-3 file:font-medium file:text-plumb-800"
          />
        </div>
        <div className="rounded-md bg-slate-50 px-3 py-2 text-xs leading-relaxed text-slate-700">
          <p>
            <span className="font-semibold">Required columns:</span>{' '}
            <code className="font-mono">{columnsOfList.required.join(', ')}</code>
          </p>
          <p>
            <span className="font-semibold">Optional:</span>{' '}
            <code className="font-mono">{columnsOfList.optional.join(', ')}</code>
          </p>
          <p className="mt-1 text-slate-600">
            A row whose {columnsOfList.required[0].replace('_', ' ')} is new creates an entry; an existing one
            is updated. A blank cell clears an optional field.
            {list === 'control-lots' ? ' Levels are separated by “;”, e.g. 1;2;3.' : ''}
          </p>
        </div>
      </div>

      {importer.error ? (
        <div className="mt-4">
          <Alert tone="error" title="The file could not be checked">
            {errorMessage(importer.error)}
          </Alert>
        </div>
      ) : null}

      {preview ? (
        <div className="mt-5">
          <ImportPreview key={previewVersion} result={preview} />
        </div>
      ) : null}

      {blocked ? (
        <p id={blockedId} className="mt-3 text-sm text-alarm-800">
          Nothing can be imported while any row has an error. Fix those rows in the file, choose it again and
          check it.
        </p>
      ) : null}

      <DialogActions>
        <Button variant="secondary" onClick={onClose}>
          Cancel
        </Button>
        {preview ? (
          <Button
            onClick={apply}
            isLoading={importer.isPending}
            disabled={blocked || nothingToDo}
            aria-describedby={blocked ? blockedId : undefined}
          >
            Apply import
          </Button>
        ) : (
          <Button onClick={check} isLoading={importer.isPending} disabled={!file}>
            Check the file
          </Button>
        )}
      </DialogActions>
    </div>
  );
}
