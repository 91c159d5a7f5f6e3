// Every adjustment of the lot and analyte, newest first: what, why, who and when, and an Undo for
// those still in force. Undoing recomputes the figures as they were before the adjustment.
import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { PeerGroupAdjustment } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime } from '../../../utils/format.ts';
import { useUndoAdjustment } from '../api/adjust-peer-groups.ts';
import { peerGroupsKeys } from '../api/peer-groups-keys.ts';

const kindLabels: Record<PeerGroupAdjustment['kind'], string> = {
  merge: 'Merge',
  split: 'Split',
  move: 'Move',
  exclude: 'Exclusion',
};

const column = createColumnHelper<PeerGroupAdjustment>();

export function AdjustmentsHistory({ controlLotId, analyteId }: { controlLotId: string; analyteId: string }) {
  const adjustments = useQuery(peerGroupsKeys.adjustments({ controlLotId, analyteId }));
  const undo = useUndoAdjustment();
  const [undoing, setUndoing] = useState<PeerGroupAdjustment | null>(null);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'at', desc: true }]);

  // Stable columns: TanStack renders a cell function as a component, so a new one each render would
  // replace the row's buttons under the pointer.
  const columns = useMemo(
    () => [
      column.accessor('at', {
        header: 'When',
        cell: (c) => (
          <time dateTime={c.getValue()} className="whitespace-nowrap">
            {formatDateTime(c.getValue())}
          </time>
        ),
      }),
      column.accessor('kind', {
        header: 'Adjustment',
        cell: (c) => <Badge tone="plumb">{kindLabels[c.getValue()]}</Badge>,
      }),
      column.accessor('description', {
        header: 'What',
        cell: (c) => (
          <span className="block max-w-xl">
            {c.getValue()}
            {c.row.original.undone ? (
              <span className="block text-xs text-slate-500">
                Undone {formatDateTime(c.row.original.undone.at)}
                {c.row.original.undone.actor ? ` by ${c.row.original.undone.actor.name}` : ''}
                {c.row.original.undone.reason ? `: ${c.row.original.undone.reason}` : ''}
              </span>
            ) : null}
          </span>
        ),
      }),
      column.accessor('reason', {
        header: 'Why',
        cell: (c) => <span className="block max-w-xs">{c.getValue()}</span>,
      }),
      column.accessor((a) => a.actor?.name ?? '—', { id: 'actor', header: 'Who' }),
      column.display({
        id: 'actions',
        header: () => <span className="sr-only">Actions</span>,
        meta: { align: 'right' },
        cell: (c) =>
          c.row.original.undone ? (
            <Badge tone="muted">Undone</Badge>
          ) : (
            <Button
              variant="ghost"
              size="xs"
              onClick={() => setUndoing(c.row.original)}
              aria-label={`Undo: ${c.row.original.description}`}
            >
              Undo
            </Button>
          ),
      }),
    ],
    [],
  );
  const table = useReactTable({
    data: adjustments.data ?? [],
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (a) => String(a.id),
  });

  const dismiss = () => {
    undo.reset();
    setUndoing(null);
  };

  return (
    <section aria-labelledby="adjustments-heading" className="space-y-2">
      <h2 id="adjustments-heading" className="text-lg font-semibold text-plumb-950">
        Adjustments
      </h2>
      <p className="text-sm text-slate-600">
        Merges, splits and moves hold for every period of this lot; exclusions for their period. Undoing one
        recomputes the figures as they were.
      </p>
      {adjustments.isError ? (
        <Alert tone="error" title="The adjustments could not be loaded">
          {errorMessage(adjustments.error)}
        </Alert>
      ) : (
        <DataTable
          table={table}
          caption="Adjustments of this lot and analyte"
          emptyMessage={
            adjustments.isPending ? 'Loading…' : 'No adjustment yet: the groups follow the grouping rule.'
          }
        />
      )}
      <ConfirmDialog
        open={undoing !== null}
        onClose={dismiss}
        title="Undo this adjustment?"
        confirmLabel="Undo adjustment"
        reason="optional"
        isPending={undo.isPending}
        error={undo.error ? errorMessage(undo.error) : null}
        onConfirm={(reason) => {
          if (!undoing) return;
          undo.mutate(
            { id: undoing.id, reason },
            {
              onSuccess: () => {
                showToast('The adjustment was undone and the figures recomputed.');
                dismiss();
              },
            },
          );
        }}
      >
        <p>{undoing?.description}.</p>
        <p>The groups and figures return to what they were before it. Published versions do not change.</p>
      </ConfirmDialog>
    </section>
  );
}
