// Renders a TanStack table: dense rows, figures in tabular numbers, sortable headers that are buttons
// (with aria-sort on the header cell), and a plain sentence when there are no rows. The caller builds
// the table (client-side or server-side sorting and paging); this only draws it.
import type { ReactNode } from 'react';
import { flexRender, type Header, type RowData, type Table } from '@tanstack/react-table';

declare module '@tanstack/react-table' {
  // eslint-disable-next-line @typescript-eslint/no-unused-vars
  interface ColumnMeta<TData extends RowData, TValue> {
    /** Figures are right-aligned so their digits line up. */
    align?: 'left' | 'right';
    /** Extra classes for the column's cells (e.g. a fixed width). */
    className?: string;
  }
}

function SortIndicator({ direction }: { direction: false | 'asc' | 'desc' }) {
  return (
    <span aria-hidden="true" className={`text-[0.65rem] ${direction ? 'text-plumb-700' : 'text-slate-300'}`}>
      {direction === 'asc' ? '▲' : direction === 'desc' ? '▼' : '▲▼'}
    </span>
  );
}

function HeaderCell<T>({ header }: { header: Header<T, unknown> }) {
  const meta = header.column.columnDef.meta;
  const right = meta?.align === 'right';
  const sorted = header.column.getIsSorted();
  const content = header.isPlaceholder
    ? null
    : flexRender(header.column.columnDef.header, header.getContext());
  return (
    <th
      scope="col"
      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
      className={`border-b border-slate-200 bg-slate-50 px-3 py-2 text-xs font-semibold whitespace-nowrap text-slate-600 ${
        right ? 'text-right' : 'text-left'
      } ${meta?.className ?? ''}`}
    >
      {header.column.getCanSort() ? (
        <button
          type="button"
          onClick={header.column.getToggleSortingHandler()}
          className={`inline-flex items-center gap-1 rounded-sm hover:text-plumb-900 ${right ? 'flex-row-reverse' : ''}`}
        >
          {content}
          <SortIndicator direction={sorted} />
        </button>
      ) : (
        content
      )}
    </th>
  );
}

export function DataTable<T>({
  table,
  caption,
  emptyMessage,
  isFetching = false,
  rowClassName,
  renderDetail,
}: {
  table: Table<T>;
  /** Read by screen readers; hidden on screen (the page heading already says it). */
  caption: string;
  emptyMessage: ReactNode;
  /** A newer page is on its way: dim the rows a little rather than blank them. */
  isFetching?: boolean;
  rowClassName?: (row: T) => string;
  /** Extra content shown under a row when it returns something (e.g. an expanded detail). */
  renderDetail?: (row: T) => ReactNode;
}) {
  const rows = table.getRowModel().rows;
  const columnCount = table.getVisibleLeafColumns().length;
  return (
    <div className="overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-xs">
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => (
                <HeaderCell key={header.id} header={header} />
              ))}
            </tr>
          ))}
        </thead>
        <tbody
          className={isFetching ? 'opacity-60 transition-opacity' : undefined}
          aria-busy={isFetching || undefined}
        >
          {rows.length === 0 ? (
            <tr>
              <td colSpan={columnCount} className="px-3 py-8 text-center text-sm text-slate-600">
                {emptyMessage}
              </td>
            </tr>
          ) : (
            rows.map((row) => {
              const detail = renderDetail?.(row.original);
              return (
                <RowWithDetail key={row.id} columnCount={columnCount} detail={detail}>
                  <tr
                    className={`border-b border-slate-100 last:border-b-0 hover:bg-plumb-50/40 ${rowClassName?.(row.original) ?? ''}`}
                  >
                    {row.getVisibleCells().map((cell) => {
                      const meta = cell.column.columnDef.meta;
                      return (
                        <td
                          key={cell.id}
                          className={`px-3 py-2 align-top ${meta?.align === 'right' ? 'text-right' : ''} ${meta?.className ?? ''}`}
                        >
                          {flexRender(cell.column.columnDef.cell, cell.getContext())}
                        </td>
                      );
                    })}
                  </tr>
                </RowWithDetail>
              );
            })
          )}
        </tbody>
      </table>
    </div>
  );
}

function RowWithDetail({
  children,
  detail,
  columnCount,
}: {
  children: ReactNode;
  detail: ReactNode;
  columnCount: number;
}) {
  if (!detail) return <>{children}</>;
  return (
    <>
      {children}
      <tr className="border-b border-slate-100 bg-slate-50/60">
        <td colSpan={columnCount} className="px-3 py-3">
          {detail}
        </td>
      </tr>
    </>
  );
}
