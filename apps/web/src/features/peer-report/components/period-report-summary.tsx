// A small panel with one period's report of the lab: how many results are stored, how many have peer
// figures, how many carry a flag, and the first rows. The full report lives on the peer report page.
import { useId } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { Period, PeerReport } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { paths } from '../../../config/paths.ts';
import { formatCount, formatDate, formatPeriod } from '../../../utils/format.ts';
import { peerReportKeys } from '../api/peer-report-keys.ts';
import { defaultReportPeriod } from '../utils/default-period.ts';

const ROWS_SHOWN = 6;
const STATISTICS_POLL_MS = 2000;

function periodStateText(period: Period): string {
  if (period.state === 'published') return 'Peer figures published';
  if (period.state === 'closed') return 'Closed: peer figures being prepared';
  return `Open: data due by ${formatDate(period.deadline)}`;
}

function needsAttention(row: PeerReport['rows'][number]): boolean {
  return row.flags.some((flag) => flag.severity === 'warning' || flag.severity === 'action');
}

function formatSdi(value: number | null): string {
  if (value === null) return '—';
  return `${value > 0 ? '+' : ''}${value.toFixed(2)}`;
}

function Figure({ value, label }: { value: number; label: string }) {
  return (
    <div className="rounded-md bg-plumb-50 px-3 py-2">
      <dd className="figures text-xl font-semibold text-plumb-900">{formatCount(value)}</dd>
      <dt className="text-xs leading-snug text-slate-600">{label}</dt>
    </div>
  );
}

function ReportFigures({ report }: { report: PeerReport }) {
  const rows = report.rows;
  if (rows.length === 0) {
    return (
      <p className="text-sm text-slate-700">
        No results of your lab are stored for {formatPeriod(report.period)} yet.
      </p>
    );
  }
  const compared = rows.filter((row) => row.peer !== null).length;
  const pending = report.statisticsPending ? (
    <p className="mt-3 flex items-center gap-2 text-xs text-slate-600">
      <Spinner className="size-3.5" />
      Peer figures are being recomputed with the new data.
    </p>
  ) : null;
  const flagged = rows.filter(needsAttention).length;
  return (
    <>
      <dl className="grid grid-cols-3 gap-2">
        <Figure value={rows.length} label="results stored" />
        <Figure value={compared} label="compared with peers" />
        <Figure value={flagged} label="with a flag to look at" />
      </dl>
      {pending}
      <table className="mt-4 w-full text-left text-sm">
        <caption className="sr-only">First results of {formatPeriod(report.period)}</caption>
        <thead>
          <tr className="border-b border-slate-200 text-xs text-slate-500">
            <th scope="col" className="py-1.5 pr-2 font-medium">
              Procedure
            </th>
            <th scope="col" className="py-1.5 pr-2 font-medium">
              Level
            </th>
            <th scope="col" className="py-1.5 pr-2 text-right font-medium">
              Your mean
            </th>
            <th scope="col" className="py-1.5 text-right font-medium">
              SDI
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.slice(0, ROWS_SHOWN).map((row) => (
            <tr
              key={`${row.procedure.id}/${row.controlLot.id}/${row.level}`}
              className="border-b border-slate-100"
            >
              <th scope="row" className="py-1.5 pr-2 font-medium text-slate-900">
                {row.procedure.code}
                <span className="block text-xs font-normal text-slate-500">{row.analyte.name}</span>
              </th>
              <td className="py-1.5 pr-2">{row.level}</td>
              <td className="py-1.5 pr-2 text-right whitespace-nowrap">
                {row.lab.mean === null ? '—' : row.lab.mean.toFixed(row.analyte.decimals + 1)}{' '}
                <span className="text-xs text-slate-500">{row.unit}</span>
              </td>
              <td className="py-1.5 text-right">{formatSdi(row.sdi)}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {rows.length > ROWS_SHOWN ? (
        <p className="mt-2 text-xs text-slate-600">
          and {formatCount(rows.length - ROWS_SHOWN)} more in the full report.
        </p>
      ) : null}
    </>
  );
}

/**
 * `period` null means "the period the lab is most likely working on" (see defaultReportPeriod).
 * The panel refreshes whenever peerReportKeys.details() is invalidated, e.g. after an upload is stored.
 */
export function PeriodReportSummary({
  labId,
  period,
  onPeriodChange,
}: {
  labId: string;
  period: string | null;
  onPeriodChange: (period: string) => void;
}) {
  const headingId = useId();
  const selectId = useId();
  const periods = useQuery(peerReportKeys.periods());
  const list = periods.data ?? [];
  const chosen = period ?? defaultReportPeriod(list);
  const report = useQuery({
    ...peerReportKeys.detail({ labId, period: chosen ?? '' }),
    enabled: chosen !== null,
    // Newly stored data is folded into the peer figures within seconds: ask again until it is.
    refetchInterval: (query) => (query.state.data?.statisticsPending ? STATISTICS_POLL_MS : false),
  });
  const chosenPeriod = list.find((p) => p.period === chosen);
  // A period named by an upload but not (yet) in the list still gets an option.
  const options =
    chosen && !chosenPeriod ? [chosen, ...list.map((p) => p.period)] : list.map((p) => p.period);
  const sortedOptions = [...new Set(options)].sort((a, b) => b.localeCompare(a));

  return (
    <section
      aria-labelledby={headingId}
      className="self-start rounded-lg border border-slate-200 bg-white p-5 shadow-xs"
    >
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h2 id={headingId} className="text-base font-semibold text-plumb-950">
            Report for the period
          </h2>
          {chosenPeriod ? (
            <p className="mt-0.5 text-xs text-slate-600">{periodStateText(chosenPeriod)}</p>
          ) : null}
        </div>
        {sortedOptions.length > 0 ? (
          <div className="flex items-center gap-2">
            <label htmlFor={selectId} className="text-xs font-medium text-slate-600">
              Period
            </label>
            <select
              id={selectId}
              value={chosen ?? ''}
              onChange={(event) => onPeriodChange(event.target.value)}
              className="h-8 rounded-md border border-slate-300 bg-white px-2 text-sm text-slate-900"
            >
              {sortedOptions.map((value) => (
                <option key={value} value={value}>
                  {formatPeriod(value)}
                </option>
              ))}
            </select>
          </div>
        ) : null}
      </div>

      <div className="mt-4" aria-live="polite" aria-busy={report.isFetching || undefined}>
        {periods.isError ? (
          <Alert tone="error">{periods.error.message}</Alert>
        ) : chosen === null ? (
          periods.isPending ? (
            <Spinner label="Loading the periods" />
          ) : (
            <p className="text-sm text-slate-700">The network has not opened a monthly period yet.</p>
          )
        ) : report.isError ? (
          <Alert tone="error">{report.error.message}</Alert>
        ) : report.data ? (
          <ReportFigures report={report.data} />
        ) : (
          <Spinner label="Loading the report" />
        )}
      </div>

      <p className="mt-4 text-sm">
        <Link
          to={paths.lab.peerReport.getHref()}
          className="font-medium text-plumb-700 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-900"
        >
          Open the full peer report
        </Link>
      </p>
    </section>
  );
}
