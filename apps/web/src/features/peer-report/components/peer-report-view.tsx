// The lab's peer report for one period: choice of period and units, whether the figures are published
// or provisional, counts of flags, filters, the report table, downloads and the caution.
import { useId, useMemo, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { PeerReport, PeerReportRow, UnitSystem } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { SeverityIcon, severityLabels } from '../../../components/charts/severity.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDate, formatPeriod } from '../../../utils/format.ts';
import { peerReportKeys } from '../api/peer-report-keys.ts';
import { defaultReportPeriod } from '../utils/default-period.ts';
import {
  analytesOf,
  filterRows,
  isFlagged,
  worstFlag,
  type ReportFilters,
  type Severity,
} from '../utils/report-rows.ts';
import { ReportCaution } from './report-caution.tsx';
import { ReportDownloadButtons } from './download-buttons.tsx';
import { ReportStatus } from './report-status.tsx';
import { ReportTable, type RowNote } from './report-table.tsx';

const STATISTICS_POLL_MS = 2000;

export type ReportChoice = {
  /** Null: the period the lab is most likely working on. */
  period: string | null;
  /** Null: the lab's preferred units. */
  units: UnitSystem | null;
  filters: ReportFilters;
};

function FlagCounts({ report }: { report: PeerReport }) {
  const counts: Record<Severity, number> = { fine: 0, acceptable: 0, warning: 0, action: 0 };
  for (const row of report.rows) counts[worstFlag(row) ?? 'fine'] += 1;
  const compared = report.rows.filter((row) => row.peer !== null).length;
  return (
    <dl className="flex flex-wrap gap-x-6 gap-y-2 text-sm" aria-label="Results by flag">
      <div>
        <dt className="text-xs text-slate-500">Results</dt>
        <dd className="figures font-semibold text-slate-900">
          {report.rows.length}{' '}
          <span className="text-xs font-normal text-slate-500">({compared} compared with peers)</span>
        </dd>
      </div>
      {(['action', 'warning', 'acceptable', 'fine'] as const).map((severity) => (
        <div key={severity}>
          <dt className="text-xs text-slate-500">{severityLabels[severity]}</dt>
          <dd className="figures inline-flex items-center gap-1.5 font-semibold text-slate-900">
            <SeverityIcon severity={severity} />
            {counts[severity]}
          </dd>
        </div>
      ))}
    </dl>
  );
}

function Filters({
  report,
  filters,
  onChange,
}: {
  report: PeerReport;
  filters: ReportFilters;
  onChange: (filters: ReportFilters) => void;
}) {
  const analyteId = useId();
  const severityId = useId();
  const analytes = analytesOf(report.rows);
  return (
    <div className="flex flex-wrap items-end gap-4" role="group" aria-label="Filters">
      <label className="flex h-9 items-center gap-2 text-sm font-medium text-slate-800">
        <input
          type="checkbox"
          checked={filters.flaggedOnly}
          onChange={(event) => onChange({ ...filters, flaggedOnly: event.target.checked })}
          className="size-4 accent-plumb-700"
        />
        Flagged rows only (warning or action)
      </label>
      <div className="flex flex-col gap-1">
        <label htmlFor={analyteId} className="text-xs font-medium text-slate-700">
          Analyte
        </label>
        <select
          id={analyteId}
          value={filters.analyte}
          onChange={(event) => onChange({ ...filters, analyte: event.target.value })}
          className="h-9 rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs"
        >
          <option value="">Every analyte</option>
          {analytes.map((analyte) => (
            <option key={analyte.code} value={analyte.code}>
              {analyte.name}
            </option>
          ))}
        </select>
      </div>
      <div className="flex flex-col gap-1">
        <label htmlFor={severityId} className="text-xs font-medium text-slate-700">
          Worst flag
        </label>
        <select
          id={severityId}
          value={filters.severity}
          onChange={(event) => onChange({ ...filters, severity: event.target.value as Severity | '' })}
          className="h-9 rounded-md border border-slate-300 bg-white px-2 text-sm shadow-xs"
        >
          <option value="">Any</option>
          <option value="action">Action</option>
          <option value="warning">Warning</option>
          <option value="acceptable">Acceptable</option>
          <option value="fine">Fine (or none)</option>
        </select>
      </div>
    </div>
  );
}

export function PeerReportView({
  labId,
  labCode,
  choice,
  onChoiceChange,
  detailHref,
  notes,
  review,
  downloads,
}: {
  labId: string;
  labCode?: string;
  choice: ReportChoice;
  onChoiceChange: (choice: ReportChoice) => void;
  detailHref: (row: PeerReportRow, period: string) => string;
  /** Comments per row (by reportRowKey), shown under the rows. */
  notes?: ReadonlyMap<string, RowNote>;
  /** The review of the period (sign-off), shown above the table. */
  review?: (period: string, report: PeerReport) => ReactNode;
  /** More downloads of the period, shown beside the report's own. */
  downloads?: (period: string) => ReactNode;
}) {
  const periodId = useId();
  const periods = useQuery(peerReportKeys.periods());
  const list = useMemo(() => periods.data ?? [], [periods.data]);
  const period = choice.period ?? defaultReportPeriod(list);
  const params = { labId, period: period ?? '', units: choice.units ?? undefined };
  const report = useQuery({
    ...peerReportKeys.detail(params),
    enabled: period !== null,
    refetchInterval: (query) => (query.state.data?.statisticsPending ? STATISTICS_POLL_MS : false),
  });
  const rows = useMemo(
    () => (report.data ? filterRows(report.data.rows, choice.filters) : []),
    [report.data, choice.filters],
  );
  const periodInfo = list.find((p) => p.period === period);
  const href = useMemo(() => (row: PeerReportRow) => detailHref(row, period ?? ''), [detailHref, period]);

  if (periods.isError)
    return (
      <Alert tone="error" title="The periods could not be loaded">
        {errorMessage(periods.error)}
      </Alert>
    );
  if (periods.isPending) return <Spinner label="Loading the periods" />;
  if (period === null) {
    return (
      <EmptyState
        title="No monthly period yet"
        description="The network coordinator has not opened a monthly period. Your report appears here once your lab has data for one."
      />
    );
  }
  const units = report.data?.units ?? choice.units ?? 'si';
  const flaggedCount = report.data ? report.data.rows.filter(isFlagged).length : 0;
  const notComputableCount = report.data ? report.data.rows.filter((r) => r.notComputable).length : 0;

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end justify-between gap-4 rounded-lg border border-slate-200 bg-white px-4 py-3 shadow-xs">
        <div className="flex flex-wrap items-end gap-5">
          <div className="flex flex-col gap-1">
            <label htmlFor={periodId} className="text-xs font-medium text-slate-700">
              Period
            </label>
            <select
              id={periodId}
              value={period}
              onChange={(event) => onChoiceChange({ ...choice, period: event.target.value })}
              className="h-9 rounded-md border border-slate-300 bg-white px-2 text-sm font-medium shadow-xs"
            >
              {[...list]
                .sort((a, b) => b.period.localeCompare(a.period))
                .map((p) => (
                  <option key={p.period} value={p.period}>
                    {formatPeriod(p.period)}
                    {p.state === 'open' ? ' (open)' : p.state === 'closed' ? ' (closed)' : ''}
                  </option>
                ))}
            </select>
          </div>
          <fieldset className="flex flex-col gap-1">
            <legend className="text-xs font-medium text-slate-700">Units</legend>
            <div className="flex h-9 items-center gap-3 text-sm">
              {(
                [
                  ['si', 'SI'],
                  ['conventional', 'Conventional'],
                ] as const
              ).map(([value, label]) => (
                <label key={value} className="inline-flex items-center gap-1.5">
                  <input
                    type="radio"
                    name={`${periodId}-units`}
                    value={value}
                    checked={units === value}
                    onChange={() => onChoiceChange({ ...choice, units: value })}
                    className="accent-plumb-700"
                  />
                  {label}
                </label>
              ))}
            </div>
          </fieldset>
          {periodInfo ? (
            <p className="pb-2 text-xs text-slate-600">
              {periodInfo.state === 'open'
                ? `Open: data due by ${formatDate(periodInfo.deadline)}`
                : periodInfo.state === 'closed'
                  ? 'Closed: the network is preparing the peer figures'
                  : 'Published by the network'}
            </p>
          ) : null}
        </div>
        <div className="flex flex-wrap gap-2">
          {downloads ? downloads(period) : null}
          <ReportDownloadButtons params={params} labCode={labCode} />
        </div>
      </div>

      {report.isError ? (
        <Alert tone="error" title="The report could not be loaded">
          {errorMessage(report.error)}
        </Alert>
      ) : !report.data ? (
        <Spinner label="Loading the report" />
      ) : (
        <>
          <div className="flex flex-wrap items-center justify-between gap-4">
            <ReportStatus report={report.data} />
            <FlagCounts report={report.data} />
          </div>
          {review ? review(period, report.data) : null}
          {report.data.rows.length === 0 ? (
            <EmptyState
              title={`No results of your lab for ${formatPeriod(period)}`}
              description="Upload the month's control data; the report fills in as soon as the file is stored."
            />
          ) : (
            <section aria-label="Report table" className="space-y-3">
              <Filters
                report={report.data}
                filters={choice.filters}
                onChange={(filters) => onChoiceChange({ ...choice, filters })}
              />
              <p className="text-sm text-slate-700" aria-live="polite">
                Showing <span className="font-semibold">{rows.length}</span> of {report.data.rows.length}{' '}
                results
                {flaggedCount > 0 ? ` · ${flaggedCount} flagged` : ''}
                {notComputableCount > 0
                  ? ` · ${notComputableCount} cannot be computed (the reason is under the row)`
                  : ''}
                . Open a procedure for its charts and comments.
              </p>
              <ReportTable
                rows={rows}
                caption={`Peer report of ${formatPeriod(period)}`}
                detailHref={href}
                notes={notes}
                emptyMessage="No result matches the filters."
              />
            </section>
          )}
        </>
      )}
      <ReportCaution />
    </div>
  );
}
