// Whether the peer figures of the report are the published ones (and which version) or provisional.
import type { PeerReport } from '@plumbline/contracts';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { formatDateTime } from '../../../utils/format.ts';

export function ReportStatus({ report }: { report: PeerReport }) {
  return (
    <div className="flex flex-wrap items-center gap-3">
      {report.published ? (
        <p
          data-testid="report-status"
          className="inline-flex items-center gap-2 rounded-md bg-plumb-700 px-3 py-1.5 text-sm font-medium text-white"
        >
          <svg width="12" height="12" viewBox="0 0 12 12" aria-hidden="true" focusable="false">
            <path d="M2 6.5 5 9.5 10 2.5" fill="none" stroke="currentColor" strokeWidth="2" />
          </svg>
          Published, version {report.published.version}
          <span className="font-normal text-plumb-100">· {formatDateTime(report.published.publishedAt)}</span>
        </p>
      ) : (
        <p
          data-testid="report-status"
          className="inline-flex items-center gap-2 rounded-md border border-dashed border-brass-500 bg-brass-100 px-3 py-1.5 text-sm font-medium text-brass-700"
        >
          <svg width="12" height="12" viewBox="0 0 12 12" aria-hidden="true" focusable="false">
            <circle
              cx="6"
              cy="6"
              r="4.5"
              fill="none"
              stroke="currentColor"
              strokeWidth="1.5"
              strokeDasharray="2 1.5"
            />
          </svg>
          Provisional: the peer figures may change until the network publishes the month
        </p>
      )}
      {report.statisticsPending ? (
        <p className="inline-flex items-center gap-2 text-xs text-slate-600">
          <Spinner className="size-3.5" />
          Peer figures are being recomputed with new data.
        </p>
      ) : null}
    </div>
  );
}
