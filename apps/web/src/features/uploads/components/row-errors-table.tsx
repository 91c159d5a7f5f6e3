import { useId, useMemo, useState } from 'react';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { RowError } from '@plumbline/contracts';
import { Button } from '../../../components/ui/button.tsx';
import { formatCount } from '../../../utils/format.ts';
import { rowErrorsCsv, rowErrorsFilename } from '../utils/row-errors-csv.ts';

const FIRST_ROWS_SHOWN = 100;

const column = createColumnHelper<RowError>();
const columns = [
  column.accessor('row', { header: 'Line', sortingFn: 'basic' }),
  column.accessor((error) => error.column ?? '', {
    id: 'column',
    header: 'Column',
    cell: (info) => info.getValue() || <span className="text-slate-400">whole row</span>,
  }),
  column.accessor('code', {
    header: 'Problem',
    cell: (info) => <code className="font-mono text-xs text-alarm-800">{info.getValue()}</code>,
  }),
  column.accessor('message', { header: 'What to fix' }),
];

function downloadCsv(text: string, filename: string) {
  const url = URL.createObjectURL(new Blob([text], { type: 'text/csv;charset=utf-8' }));
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
  // Revoked a moment later: some browsers read the blob after click() returns.
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}

/** The rejected rows of a file, sortable by each column and downloadable as CSV. */
export function RowErrorsTable({
  errors,
  filename,
  totalRejected,
}: {
  errors: RowError[];
  /** The uploaded file's name, to name the download after it. */
  filename: string;
  /** Every rejected row, including those beyond the stored error list. */
  totalRejected: number;
}) {
  const captionId = useId();
  const [sorting, setSorting] = useState<SortingState>([{ id: 'row', desc: false }]);
  const [showAll, setShowAll] = useState(false);
  const data = useMemo(() => errors, [errors]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
  });
  const rows = table.getRowModel().rows;
  const shown = showAll ? rows : rows.slice(0, FIRST_ROWS_SHOWN);

  return (
    <div>
      <div className="flex flex-wrap items-end justify-between gap-3">
        <p id={captionId} className="text-sm font-semibold text-slate-900">
          Rejected rows
          {totalRejected > errors.length ? (
            <span className="ml-1 font-normal text-slate-600">
              (the first {formatCount(errors.length)} of {formatCount(totalRejected)} are listed)
            </span>
          ) : null}
        </p>
        <Button
          variant="secondary"
          size="sm"
          onClick={() =>
            downloadCsv(
              rowErrorsCsv(table.getSortedRowModel().rows.map((r) => r.original)),
              rowErrorsFilename(filename),
            )
          }
        >
          Download the list (CSV)
        </Button>
      </div>
      <div className="mt-2 max-h-[28rem] overflow-auto rounded-lg border border-slate-200 bg-white">
        <table aria-labelledby={captionId} className="w-full text-left text-sm">
          <thead className="sticky top-0 bg-slate-50 text-xs text-slate-600 shadow-[0_1px_0_var(--color-slate-200)]">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const sorted = header.column.getIsSorted();
                  return (
                    <th
                      key={header.id}
                      scope="col"
                      aria-sort={
                        sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined
                      }
                      className="px-3 py-2 font-medium"
                    >
                      <button
                        type="button"
                        onClick={header.column.getToggleSortingHandler()}
                        className="inline-flex items-center gap-1 rounded-sm hover:text-plumb-900"
                      >
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden="true" className="text-[0.65rem] text-plumb-500">
                          {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '↕'}
                        </span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {shown.map((row) => (
              <tr key={row.id} className="border-t border-slate-100 align-top">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-3 py-2 ${cell.column.id === 'row' ? 'figures w-16' : ''}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {rows.length > FIRST_ROWS_SHOWN && !showAll ? (
        <div className="mt-2">
          <Button variant="secondary" size="sm" onClick={() => setShowAll(true)}>
            Show all {formatCount(rows.length)} listed rows
          </Button>
        </div>
      ) : null}
      <p className="mt-2 text-xs text-slate-600">
        Line numbers count the header as line 1, as a spreadsheet shows them.
      </p>
    </div>
  );
}
