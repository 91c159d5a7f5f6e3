// The peer report as a table: per procedure, control lot and level, the lab's figures beside the peer
// group's, where the lab stands (SDI, CVR, bias, sigma, cumulative SDI), its flags and comments.
// Sorting with TanStack Table; the filtering happens before (filterRows), so counts stay honest.
import { Fragment, useMemo, useState } from 'react';
import { Link } from 'react-router-dom';
import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type Header,
  type SortingState,
} from '@tanstack/react-table';
import { teaRuleText, type PeerReportRow } from '@plumbline/contracts';
import { formatDate } from '../../../utils/format.ts';
import { fixed, keyOfRow, peerTierWords, signed, worstFlag } from '../utils/report-rows.ts';
import { FlagChips } from './flag-chips.tsx';

/** A summary of a row's corrective-action comments, handed in by the page. */
export type RowNote = { count: number; latest: { body: string; author: string; createdAt: string } | null };

const severityRank = { fine: 0, acceptable: 1, warning: 2, action: 3 } as const;

const column = createColumnHelper<PeerReportRow>();

function sigmaTitle(row: PeerReportRow): string {
  const rule = teaRuleText(row.analyte, row.canonicalUnit);
  if (rule === null) return 'No total allowable error (TEa) is set for this analyte, so no sigma metric.';
  const source = row.analyte.teaSource ? ` from ${row.analyte.teaSource}` : '';
  if (row.tea === null) return `TEa ${rule}${source}; no peer mean to evaluate it at, so no sigma metric.`;
  const governs =
    row.tea.governing === 'both'
      ? 'both parts agree'
      : `the ${row.tea.governing === 'absolute' ? 'absolute' : 'percentage'} part governs`;
  return `Sigma = (TEa − |bias %|) / CV %, with TEa ${rule}${source}: ${row.tea.pct.toFixed(2)} % at this level's peer mean (${governs}).`;
}

function buildColumns(
  detailHref: (row: PeerReportRow) => string,
  notes: ReadonlyMap<string, RowNote> | undefined,
) {
  return [
    column.group({
      id: 'what',
      header: () => <span className="sr-only">Procedure</span>,
      columns: [
        column.accessor((row) => `${row.analyte.name} ${row.procedure.code}`, {
          id: 'procedure',
          header: 'Procedure',
          cell: ({ row: { original: row } }) => (
            <span className="block w-[9rem]">
              <Link
                to={detailHref(row)}
                className="font-semibold text-plumb-800 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-950"
                aria-label={`${row.analyte.name}, ${row.procedure.code}, lot ${row.controlLot.lotNumber}, level ${row.level}: open the charts`}
              >
                {row.analyte.name}
              </Link>
              <span className="block text-xs text-slate-600">
                {row.procedure.code} · {row.unit}
              </span>
              <span className="block text-xs text-slate-500">lot {row.controlLot.lotNumber}</span>
              {row.late ? (
                <span className="mt-0.5 inline-block rounded bg-brass-100 px-1 text-[0.7rem] font-medium text-brass-700">
                  arrived late
                </span>
              ) : null}
            </span>
          ),
        }),
        column.accessor('level', { header: 'Level', meta: { align: 'right' } }),
      ],
    }),
    column.group({
      id: 'lab',
      header: 'Your lab',
      columns: [
        column.accessor((row) => row.lab.n, { id: 'labN', header: 'n', meta: { align: 'right' } }),
        column.accessor((row) => row.lab.mean, {
          id: 'labMean',
          header: 'Mean',
          meta: { align: 'right' },
          cell: ({ row: { original: row } }) => fixed(row.lab.mean, row.decimals + 1),
        }),
        column.accessor((row) => row.lab.sd, {
          id: 'labSd',
          header: 'SD',
          meta: { align: 'right' },
          cell: ({ row: { original: row } }) => fixed(row.lab.sd, row.decimals + 1),
        }),
        column.accessor((row) => row.lab.cv, {
          id: 'labCv',
          header: 'CV %',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => fixed(row.lab.cv, 2),
        }),
      ],
    }),
    column.group({
      id: 'peer',
      header: 'Peer group',
      columns: [
        column.accessor((row) => row.peer?.labs, {
          id: 'peerTier',
          header: 'Compared with',
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) =>
            row.peer ? (
              <span className="block w-[7.5rem] text-xs leading-snug" title={row.peerNote}>
                <span className="font-medium text-slate-800">{row.peer.labs} labs</span>
                <span className="text-slate-600">, {peerTierWords[row.peer.tier]}</span>
              </span>
            ) : (
              <span className="block w-[7.5rem] text-xs leading-snug text-slate-600">
                No peer group: {row.peerNote}
              </span>
            ),
        }),
        column.accessor((row) => row.peer?.mean, {
          id: 'peerMean',
          header: 'Mean',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => fixed(row.peer?.mean, row.decimals + 1),
        }),
        column.accessor((row) => row.peer?.sd, {
          id: 'peerSd',
          header: 'SD',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => fixed(row.peer?.sd, row.decimals + 1),
        }),
        column.accessor((row) => row.peer?.cv ?? undefined, {
          id: 'peerCv',
          header: 'CV %',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => fixed(row.peer?.cv, 2),
        }),
      ],
    }),
    column.group({
      id: 'standing',
      header: 'Where you stand',
      columns: [
        column.accessor((row) => row.sdi ?? undefined, {
          id: 'sdi',
          header: 'SDI',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) =>
            row.notComputable ? (
              <span className="block w-[4.5rem] text-xs leading-snug font-medium whitespace-normal text-alarm-700">
                cannot be computed
              </span>
            ) : (
              <span className="font-semibold">{signed(row.sdi)}</span>
            ),
        }),
        column.accessor((row) => row.cvr ?? undefined, {
          id: 'cvr',
          header: 'CVR',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => fixed(row.cvr, 2),
        }),
        column.accessor((row) => row.biasPct ?? undefined, {
          id: 'bias',
          header: 'Bias %',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => signed(row.biasPct, 1),
        }),
        column.accessor((row) => row.sigma ?? undefined, {
          id: 'sigma',
          header: 'Sigma',
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) => (
            <span title={sigmaTitle(row)} className="cursor-help border-b border-dotted border-slate-400">
              {fixed(row.sigma, 1)}
              <span className="sr-only"> ({sigmaTitle(row)})</span>
            </span>
          ),
        }),
        column.accessor((row) => row.cumulative.sdi ?? undefined, {
          id: 'cumulativeSdi',
          header: () => (
            <abbr title="SDI of the lot to date: all periods of this control lot pooled">Cum. SDI</abbr>
          ),
          meta: { align: 'right' },
          sortUndefined: 'last',
          cell: ({ row: { original: row } }) =>
            row.cumulative.notComputable ? (
              <span className="text-xs text-alarm-700" title={row.cumulative.notComputable.reason}>
                cannot be computed
              </span>
            ) : (
              signed(row.cumulative.sdi)
            ),
        }),
      ],
    }),
    column.group({
      id: 'review',
      header: () => <span className="sr-only">Review</span>,
      columns: [
        column.accessor((row) => severityRank[worstFlag(row) ?? 'fine'], {
          id: 'flags',
          header: 'Flags and comments',
          sortDescFirst: true,
          cell: ({ row: { original: row } }) => {
            const count = notes?.get(keyOfRow(row))?.count ?? 0;
            return (
              <span className="block w-[9rem]">
                <FlagChips flags={row.flags} />
                {row.excluded ? (
                  <span className="mt-1 block text-xs text-slate-600">
                    Left out of the peer figures (
                    {row.excluded.reason === 'outlier' ? 'an outlier' : 'by the coordinator'}
                    {row.excluded.note ? `: ${row.excluded.note}` : ''})
                  </span>
                ) : null}
                <Link
                  to={detailHref(row)}
                  className="mt-1 block text-xs font-medium text-plumb-700 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-900"
                >
                  {count === 0 ? 'Charts and comment' : `${count} comment${count === 1 ? '' : 's'}, charts`}
                  <span className="sr-only">
                    {' '}
                    for {row.analyte.name} level {row.level}
                  </span>
                </Link>
              </span>
            );
          },
        }),
      ],
    }),
  ];
}

function HeaderCell({ header }: { header: Header<PeerReportRow, unknown> }) {
  const meta = header.column.columnDef.meta;
  const right = meta?.align === 'right';
  const sorted = header.column.getIsSorted();
  const content = header.isPlaceholder
    ? null
    : flexRender(header.column.columnDef.header, header.getContext());
  const isGroup = header.subHeaders.length > 0;
  return (
    <th
      scope={isGroup ? 'colgroup' : 'col'}
      colSpan={header.colSpan}
      aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}
      className={`border-b border-slate-200 px-1 py-1.5 text-xs first:pl-2 font-semibold whitespace-nowrap ${
        isGroup
          ? 'border-x border-x-white bg-plumb-50 text-center text-plumb-900'
          : `bg-slate-50 text-slate-600 ${right ? 'text-right' : 'text-left'}`
      }`}
    >
      {!isGroup && header.column.getCanSort() ? (
        <button
          type="button"
          onClick={header.column.getToggleSortingHandler()}
          className={`group inline-flex items-center gap-0.5 rounded-sm hover:text-plumb-900 ${right ? 'flex-row-reverse' : ''}`}
        >
          {content}
          <span
            aria-hidden="true"
            className={`w-2 text-[0.6rem] ${sorted ? 'text-plumb-700' : 'text-transparent group-hover:text-slate-400 group-focus-visible:text-slate-400'}`}
          >
            {sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : '▲'}
          </span>
        </button>
      ) : (
        content
      )}
    </th>
  );
}

/** The line under a row whose comparison cannot be computed, saying why (the other rows are unaffected). */
function NotComputableLine({ row, colSpan, edge }: { row: PeerReportRow; colSpan: number; edge: string }) {
  return (
    <tr data-not-computable="" className={`border-b border-slate-100 border-l-4 bg-slate-50 ${edge}`}>
      <td colSpan={colSpan} className="px-2 pb-2 pl-6 text-xs text-slate-700">
        {row.notComputable ? (
          <span className="block">
            <span className="font-semibold text-alarm-700">Comparison cannot be computed:</span>{' '}
            {row.notComputable.reason}
          </span>
        ) : null}
        {row.cumulative.notComputable ? (
          <span className="block">
            <span className="font-semibold text-alarm-700">Lot-to-date comparison cannot be computed:</span>{' '}
            {row.cumulative.notComputable.reason}
          </span>
        ) : null}
      </td>
    </tr>
  );
}

const rowTint = { fine: '', acceptable: '', warning: 'bg-brass-100/40', action: 'bg-alarm-50/70' } as const;
const rowEdge = {
  fine: 'border-l-transparent',
  acceptable: 'border-l-transparent',
  warning: 'border-l-brass-400',
  action: 'border-l-alarm-700',
} as const;

export function ReportTable({
  rows,
  caption,
  detailHref,
  notes,
  emptyMessage,
}: {
  rows: readonly PeerReportRow[];
  caption: string;
  detailHref: (row: PeerReportRow) => string;
  notes?: ReadonlyMap<string, RowNote>;
  emptyMessage: string;
}) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const columns = useMemo(() => buildColumns(detailHref, notes), [detailHref, notes]);
  const data = useMemo(() => [...rows], [rows]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: keyOfRow,
  });
  const leafCount = table.getVisibleLeafColumns().length;
  return (
    // The table scrolls inside its box instead of widening the page (contain), and the screen-reader
    // texts, positioned absolutely, stay inside it too (relative).
    <div className="relative overflow-x-auto rounded-lg border border-slate-200 bg-white shadow-xs [contain:inline-size]">
      <table className="w-full border-collapse text-[0.8125rem]">
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
        <tbody>
          {table.getRowModel().rows.length === 0 ? (
            <tr>
              <td colSpan={leafCount} className="px-3 py-8 text-center text-sm text-slate-600">
                {emptyMessage}
              </td>
            </tr>
          ) : (
            table.getRowModel().rows.map((row) => {
              const worst = worstFlag(row.original) ?? 'fine';
              const note = notes?.get(row.id);
              return (
                <Fragment key={row.id}>
                  <tr
                    data-row-key={row.id}
                    data-severity={worst}
                    className={`border-b border-slate-100 border-l-4 ${rowEdge[worst]} ${rowTint[worst]}`}
                  >
                    {row.getVisibleCells().map((cell) => (
                      <td
                        key={cell.id}
                        className={`px-1 py-2 align-top first:pl-2 last:pr-2 ${cell.column.columnDef.meta?.align === 'right' ? 'text-right whitespace-nowrap' : ''}`}
                      >
                        {flexRender(cell.column.columnDef.cell, cell.getContext())}
                      </td>
                    ))}
                  </tr>
                  {row.original.notComputable || row.original.cumulative.notComputable ? (
                    <NotComputableLine row={row.original} colSpan={leafCount} edge={rowEdge[worst]} />
                  ) : null}
                  {note?.latest ? (
                    <tr
                      className={`border-b border-slate-100 border-l-4 ${rowEdge[worst]} ${rowTint[worst]}`}
                    >
                      <td colSpan={leafCount} className="px-2 pb-2 pl-6 text-xs text-slate-700">
                        <span className="font-semibold text-plumb-900">Corrective action</span>{' '}
                        <span className="text-slate-500">
                          ({note.latest.author}, {formatDate(note.latest.createdAt)}
                          {note.count > 1 ? `; ${note.count - 1} earlier` : ''}):
                        </span>{' '}
                        <span className="line-clamp-2 inline">{note.latest.body}</span>
                      </td>
                    </tr>
                  ) : null}
                </Fragment>
              );
            })
          )}
        </tbody>
      </table>
    </div>
  );
}
