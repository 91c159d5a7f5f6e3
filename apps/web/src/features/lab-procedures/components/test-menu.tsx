// The lab's test menu: every measurement procedure with its analyte, instrument model, method,
// reagent, unit and short code; register, edit, retire and restore (supervisors), CSV export.
import { useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import {
  createColumnHelper,
  getCoreRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from '@tanstack/react-table';
import type { TestMenuItem } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDate } from '../../../utils/format.ts';
import { useChangeProcedureState } from '../api/save-procedure.ts';
import { downloadTestMenuCsv, testMenuKeys } from '../api/test-menu-keys.ts';
import { ProcedureFormDialog, type ProcedureDialogRequest } from './procedure-form-dialog.tsx';

type StateRequest = { procedure: TestMenuItem; action: 'retire' | 'restore' } | null;

const column = createColumnHelper<TestMenuItem>();

function Ref({ code, name }: { code: string; name: string }) {
  return (
    <span className="block">
      <span className="text-slate-900">{name}</span>
      <span className="block text-xs text-slate-500">{code}</span>
    </span>
  );
}

export function TestMenu({ labId, canManage }: { labId: string; canManage: boolean }) {
  const menu = useQuery(testMenuKeys.menu(labId));
  const [showRetired, setShowRetired] = useState(false);
  const [sorting, setSorting] = useState<SortingState>([{ id: 'analyte', desc: false }]);
  const [dialog, setDialog] = useState<ProcedureDialogRequest>(null);
  const [stateRequest, setStateRequest] = useState<StateRequest>(null);
  const changeState = useChangeProcedureState();
  const [downloading, setDownloading] = useState(false);

  const rows = useMemo(
    () => (menu.data ?? []).filter((p) => showRetired || p.retiredAt === null),
    [menu.data, showRetired],
  );
  const retiredCount = (menu.data ?? []).filter((p) => p.retiredAt !== null).length;

  const columns = useMemo(
    () => [
      column.accessor('code', {
        header: 'Short code',
        cell: (c) => (
          <span className="font-mono text-sm font-semibold whitespace-nowrap text-plumb-900">
            {c.getValue()}
          </span>
        ),
      }),
      column.accessor((p) => p.analyte.name, {
        id: 'analyte',
        header: 'Analyte',
        cell: (c) => (
          <span className="block">
            <span className="font-medium text-slate-900">{c.row.original.analyte.name}</span>
            <span className="block text-xs text-slate-500">
              {c.row.original.analyte.code}
              {c.row.original.analyte.loinc ? ` · LOINC ${c.row.original.analyte.loinc}` : ''}
            </span>
          </span>
        ),
      }),
      column.accessor((p) => p.instrumentModel.name, {
        id: 'instrument',
        header: 'Instrument model',
        cell: (c) => <Ref {...c.row.original.instrumentModel} />,
      }),
      column.accessor((p) => p.method.name, {
        id: 'method',
        header: 'Method',
        cell: (c) => <Ref {...c.row.original.method} />,
      }),
      column.accessor((p) => p.reagent.name, {
        id: 'reagent',
        header: 'Reagent',
        cell: (c) => <Ref {...c.row.original.reagent} />,
      }),
      column.accessor('unit', {
        header: 'Unit',
        cell: (c) => <span className="font-mono text-xs">{c.getValue()}</span>,
      }),
      column.accessor((p) => (p.retiredAt ? 1 : 0), {
        id: 'state',
        header: 'State',
        cell: (c) =>
          c.row.original.retiredAt ? (
            <Badge tone="muted">Retired {formatDate(c.row.original.retiredAt)}</Badge>
          ) : (
            <Badge tone="plumb">In use</Badge>
          ),
      }),
      ...(canManage
        ? [
            column.display({
              id: 'actions',
              header: () => <span className="sr-only">Actions</span>,
              cell: (c) => {
                const p = c.row.original;
                return (
                  <span className="flex justify-end gap-1 whitespace-nowrap">
                    {p.retiredAt === null ? (
                      <>
                        <Button
                          variant="ghost"
                          size="xs"
                          aria-label={`Edit ${p.code}`}
                          onClick={() => setDialog({ mode: 'edit', procedure: p })}
                        >
                          Edit
                        </Button>
                        <Button
                          variant="ghost"
                          size="xs"
                          aria-label={`Retire ${p.code}`}
                          onClick={() => setStateRequest({ procedure: p, action: 'retire' })}
                        >
                          Retire
                        </Button>
                      </>
                    ) : (
                      <Button
                        variant="ghost"
                        size="xs"
                        aria-label={`Restore ${p.code}`}
                        onClick={() => setStateRequest({ procedure: p, action: 'restore' })}
                      >
                        Restore
                      </Button>
                    )}
                  </span>
                );
              },
            }),
          ]
        : []),
    ],
    [canManage],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting },
    onSortingChange: setSorting,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getRowId: (p) => p.id,
  });

  const closeState = () => {
    changeState.reset();
    setStateRequest(null);
  };

  return (
    <div className="space-y-4">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <label className="inline-flex items-center gap-2 text-sm text-slate-700">
          <input
            type="checkbox"
            checked={showRetired}
            onChange={(e) => setShowRetired(e.target.checked)}
            className="accent-plumb-700"
          />
          Show retired procedures ({retiredCount})
        </label>
        <div className="flex gap-2">
          <Button
            variant="secondary"
            size="sm"
            isLoading={downloading}
            onClick={async () => {
              setDownloading(true);
              try {
                await downloadTestMenuCsv(labId);
              } catch (error) {
                showToast(`The CSV could not be downloaded: ${errorMessage(error)}`, 'error');
              } finally {
                setDownloading(false);
              }
            }}
          >
            Download CSV
          </Button>
          {canManage ? (
            <Button size="sm" onClick={() => setDialog({ mode: 'register' })}>
              Register a procedure
            </Button>
          ) : null}
        </div>
      </div>
      {menu.isError ? (
        <Alert tone="error" title="The procedures could not be loaded">
          {errorMessage(menu.error)}
        </Alert>
      ) : (
        <DataTable
          table={table}
          caption="Your lab's measurement procedures"
          emptyMessage={
            menu.isPending
              ? 'Loading…'
              : 'No measurement procedure is registered yet. Register one to start sending QC data for it.'
          }
          rowClassName={(p) => (p.retiredAt ? 'text-slate-500' : '')}
        />
      )}
      <ProcedureFormDialog labId={labId} request={dialog} onClose={() => setDialog(null)} />
      <ConfirmDialog
        open={stateRequest !== null}
        onClose={closeState}
        title={
          stateRequest?.action === 'retire'
            ? `Retire ${stateRequest.procedure.code}?`
            : `Restore ${stateRequest?.procedure.code ?? ''}?`
        }
        confirmLabel={stateRequest?.action === 'retire' ? 'Retire procedure' : 'Restore procedure'}
        tone={stateRequest?.action === 'retire' ? 'danger' : 'primary'}
        reason="optional"
        isPending={changeState.isPending}
        error={changeState.error ? errorMessage(changeState.error) : null}
        onConfirm={(reason) => {
          if (!stateRequest) return;
          const { procedure, action } = stateRequest;
          changeState.mutate(
            { labId, procedureId: procedure.id, action, reason },
            {
              onSuccess: () => {
                showToast(`Procedure ${procedure.code} ${action === 'retire' ? 'retired' : 'restored'}.`);
                closeState();
              },
            },
          );
        }}
      >
        {stateRequest?.action === 'retire' ? (
          <p>
            Files can no longer send data for{' '}
            <strong className="font-semibold text-slate-900">{stateRequest.procedure.code}</strong> (
            {stateRequest.procedure.analyte.name}). Its data and reports stay, and you can restore it later.
          </p>
        ) : (
          <p>The procedure can receive QC data again under its short code.</p>
        )}
      </ConfirmDialog>
    </div>
  );
}
