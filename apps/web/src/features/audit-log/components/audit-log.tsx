// The audit log: filters (lab, actor, kind, date range), one page of events at a time, newest first,
// and a CSV export of everything the filters match. The page owns the filters (in the address, so a
// filtered view can be shared) and hands in the labs and people to choose from.
import { useEffect, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { createColumnHelper, getCoreRowModel, useReactTable } from '@tanstack/react-table';
import type { AuditEvent } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DataTable } from '../../../components/ui/data-table.tsx';
import { Pagination } from '../../../components/ui/pagination.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { useDebouncedValue } from '../../../hooks/use-debounced-value.ts';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatCount, formatDateTime } from '../../../utils/format.ts';
import { AUDIT_PAGE_SIZE, auditKeys, type AuditFilters } from '../api/audit-keys.ts';
import { useExportAuditCsv } from '../api/export-audit-csv.ts';
import { describeDetails } from '../utils/describe-details.ts';

export type AuditOption = { id: string; label: string };

/** Kinds the services record; the field also takes any other kind typed in full. */
const knownKinds = [
  'auth.sign-in',
  'auth.sign-out',
  'lab.enrol',
  'lab.update',
  'lab.deactivate',
  'lab-user.invite',
  'lab-user.update',
  'lab-user.accept-invitation',
  'lab-token.created',
  'lab-token.revoked',
  'period.create',
  'period.update',
  'period.close',
  'period.reopen',
  'upload.received',
  'upload.stored',
  'upload.confirmed',
  'upload.cancelled',
  'qc-data.replaced',
  'column-mapping.saved',
  ...['analyte', 'method', 'instrument-model', 'reagent', 'control-material', 'control-lot'].flatMap(
    (entity) => ['create', 'update', 'retire', 'restore'].map((verb) => `catalogue.${entity}.${verb}`),
  ),
];

const inputClass =
  'h-9 rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs placeholder:text-slate-400 hover:border-slate-400';

function Who({ event, onFilter }: { event: AuditEvent; onFilter: (actorId: string) => void }) {
  if (!event.actor) {
    return <span className="text-slate-700">{event.actorLabel ?? 'System'}</span>;
  }
  return (
    <span className="block">
      <button
        type="button"
        onClick={() => onFilter(event.actor!.id)}
        className="text-left font-medium text-plumb-900 underline decoration-plumb-200 underline-offset-2 hover:decoration-plumb-600"
        title="Show only what this person did"
      >
        {event.actor.name}
      </button>
      <span className="block text-xs break-all text-slate-600">{event.actor.email}</span>
    </span>
  );
}

function Details({ event }: { event: AuditEvent }) {
  const parts = describeDetails(event.details);
  if (Object.keys(event.details).length === 0) return <span className="text-slate-400">—</span>;
  return (
    <div className="max-w-md">
      {parts.length > 0 ? (
        <ul className="space-y-0.5 text-slate-700">
          {parts.map((part, index) => (
            <li key={index} className="break-words">
              {part}
            </li>
          ))}
        </ul>
      ) : null}
      <details className="mt-0.5 text-xs">
        <summary className="cursor-pointer text-plumb-700 hover:text-plumb-900">All details</summary>
        <pre className="mt-1 max-h-60 overflow-auto rounded bg-slate-50 p-2 font-mono text-[0.7rem] whitespace-pre-wrap text-slate-800">
          {JSON.stringify(event.details, null, 2)}
        </pre>
      </details>
    </div>
  );
}

const column = createColumnHelper<AuditEvent>();

export function AuditLog({
  filters,
  offset,
  onChange,
  labs,
  actors,
}: {
  filters: AuditFilters;
  offset: number;
  /** New filters (offset back to the first page) or another page of the same filters. */
  onChange: (filters: AuditFilters, offset: number) => void;
  labs: AuditOption[];
  actors: AuditOption[];
}) {
  const page = useQuery(auditKeys.page({ ...filters, limit: AUDIT_PAGE_SIZE, offset }));
  const exporter = useExportAuditCsv();
  const [kindText, setKindText] = useState(filters.kind ?? '');
  const kind = useDebouncedValue(kindText.trim(), 400);

  const setFilter = (change: AuditFilters) => onChange({ ...filters, ...change }, 0);

  // Typing in the kind field filters once the typing pauses.
  useEffect(() => {
    if (kind !== (filters.kind ?? '')) onChange({ ...filters, kind: kind || undefined }, 0);
    // Only a new debounced value should trigger this, not a change of the other filters.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [kind]);

  // A person chosen by clicking a row may not be in the list: name them from the events shown.
  const actorOptions = [...actors];
  if (filters.actorId && !actorOptions.some((a) => a.id === filters.actorId)) {
    const actor = page.data?.items.find((e) => e.actor?.id === filters.actorId)?.actor;
    actorOptions.push({
      id: filters.actorId,
      label: actor ? `${actor.name} (${actor.email})` : 'The chosen person',
    });
  }

  const columns = [
    column.accessor('at', {
      header: 'When',
      cell: (c) => (
        <time dateTime={c.getValue()} title={c.getValue()} className="whitespace-nowrap">
          {formatDateTime(c.getValue())}
        </time>
      ),
    }),
    column.display({
      id: 'who',
      header: 'Who',
      cell: (c) => <Who event={c.row.original} onFilter={(actorId) => setFilter({ actorId })} />,
    }),
    column.accessor((e) => e.lab?.code ?? '', {
      id: 'lab',
      header: 'Lab',
      cell: (c) =>
        c.getValue() ? (
          <span className="font-medium whitespace-nowrap">{c.getValue()}</span>
        ) : (
          <span className="text-slate-400">—</span>
        ),
    }),
    column.accessor('kind', {
      header: 'What',
      cell: (c) => (
        <span className="block">
          <code className="font-mono text-xs whitespace-nowrap text-plumb-900">{c.getValue()}</code>
          {c.row.original.entity ? (
            <span className="block text-xs text-slate-500">
              {c.row.original.entity}
              {c.row.original.entityId && c.row.original.entity === 'period'
                ? ` ${c.row.original.entityId}`
                : ''}
            </span>
          ) : null}
        </span>
      ),
    }),
    column.display({ id: 'details', header: 'Details', cell: (c) => <Details event={c.row.original} /> }),
  ];
  const table = useReactTable({
    data: page.data?.items ?? [],
    columns,
    // The API always answers newest first; sorting one page would mislead.
    enableSorting: false,
    getCoreRowModel: getCoreRowModel(),
    getRowId: (e) => String(e.id),
  });

  const anyFilter = Boolean(filters.actorId || filters.labId || filters.kind || filters.from || filters.to);
  const rangeReversed = Boolean(filters.from && filters.to && filters.from > filters.to);

  return (
    <div>
      <form
        aria-label="Filter the audit log"
        onSubmit={(event) => event.preventDefault()}
        className="mb-4 flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 bg-white px-4 py-3 shadow-xs"
      >
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-lab" className="text-xs font-medium text-slate-700">
            Lab
          </label>
          <select
            id="audit-lab"
            value={filters.labId ?? ''}
            onChange={(event) => setFilter({ labId: event.target.value || undefined })}
            className={`${inputClass} max-w-[14rem]`}
          >
            <option value="">All labs</option>
            {labs.map((lab) => (
              <option key={lab.id} value={lab.id}>
                {lab.label}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-actor" className="text-xs font-medium text-slate-700">
            Who
          </label>
          <select
            id="audit-actor"
            value={filters.actorId ?? ''}
            onChange={(event) => setFilter({ actorId: event.target.value || undefined })}
            className={`${inputClass} max-w-[16rem]`}
            aria-describedby="audit-actor-hint"
          >
            <option value="">Anyone</option>
            {actorOptions.map((actor) => (
              <option key={actor.id} value={actor.id}>
                {actor.label}
              </option>
            ))}
          </select>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-kind" className="text-xs font-medium text-slate-700">
            Kind
          </label>
          <input
            id="audit-kind"
            list="audit-kinds"
            value={kindText}
            onChange={(event) => setKindText(event.target.value)}
            placeholder="e.g. lab.update"
            spellCheck={false}
            className={`${inputClass} w-56 font-mono`}
          />
          <datalist id="audit-kinds">
            {knownKinds.map((k) => (
              <option key={k} value={k} />
            ))}
          </datalist>
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-from" className="text-xs font-medium text-slate-700">
            From
          </label>
          <input
            id="audit-from"
            type="date"
            value={filters.from ?? ''}
            onChange={(event) => setFilter({ from: event.target.value || undefined })}
            className={inputClass}
          />
        </div>
        <div className="flex flex-col gap-1">
          <label htmlFor="audit-to" className="text-xs font-medium text-slate-700">
            To (inclusive)
          </label>
          <input
            id="audit-to"
            type="date"
            value={filters.to ?? ''}
            onChange={(event) => setFilter({ to: event.target.value || undefined })}
            aria-invalid={rangeReversed || undefined}
            aria-describedby={rangeReversed ? 'audit-range-error' : undefined}
            className={inputClass}
          />
        </div>
        <p id="audit-actor-hint" className="w-full text-xs text-slate-500">
          Choose a lab to pick one of its users; select a name in the log to see only what that person did.
          Dates are days in UTC.
        </p>
        {rangeReversed ? (
          <p id="audit-range-error" role="alert" className="w-full text-sm font-medium text-alarm-700">
            The end date is before the start date, so nothing can match.
          </p>
        ) : null}
      </form>

      <div className="mb-2 flex flex-wrap items-center justify-between gap-3">
        <p className="text-sm text-slate-700" aria-live="polite">
          {page.data
            ? `${formatCount(page.data.total)} ${page.data.total === 1 ? 'event' : 'events'}${
                anyFilter ? (page.data.total === 1 ? ' matches the filters' : ' match the filters') : ''
              }, newest first`
            : ''}
        </p>
        <div className="flex gap-2">
          {anyFilter ? (
            <Button
              variant="ghost"
              size="sm"
              onClick={() => {
                setKindText('');
                onChange({}, 0);
              }}
            >
              Clear filters
            </Button>
          ) : null}
          <Button
            variant="secondary"
            size="sm"
            isLoading={exporter.isPending}
            onClick={() =>
              exporter.mutate(filters, {
                onSuccess: (filename) => showToast(`Exported ${filename}.`),
                onError: (error) => showToast(`The export failed: ${errorMessage(error)}`, 'error'),
              })
            }
          >
            Export CSV
          </Button>
        </div>
      </div>

      {page.isError ? (
        <Alert tone="error" title="The audit log could not be loaded">
          {errorMessage(page.error)}
        </Alert>
      ) : (
        <>
          <DataTable
            table={table}
            caption="Audit events, newest first"
            emptyMessage={
              page.isPending
                ? 'Loading…'
                : anyFilter
                  ? 'No event matches these filters.'
                  : 'Nothing has been recorded yet.'
            }
            isFetching={page.isPlaceholderData}
          />
          <Pagination
            label="Audit log pages"
            total={page.data?.total ?? 0}
            limit={AUDIT_PAGE_SIZE}
            offset={offset}
            onOffsetChange={(next) => onChange(filters, next)}
          />
        </>
      )}
    </div>
  );
}
