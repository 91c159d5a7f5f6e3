// The lab's home: the period it is submitting for (deadline, submitted, late, signed), its flags by
// severity, what needs attention next, and its latest uploads.
import { useState, type ReactNode } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { AttentionItem, LabOverview, UploadSummary } from '@plumbline/contracts';
import { SeverityIcon, severityLabels, type Severity } from '../../../components/charts/severity.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { Badge } from '../../../components/ui/badge.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDate, formatDateTime, formatPeriod } from '../../../utils/format.ts';
import { downloadUploadsCsv, labOverviewKeys } from '../api/lab-overview-keys.ts';

const uploadKindWords = {
  'qc-summary': 'monthly summary',
  'qc-values': 'daily values',
  'patient-results': 'patient results',
  'fhir-bundle': 'patient results (FHIR)',
} as const;

export type OverviewLinks = {
  uploads: string;
  report: (search?: Record<string, string | undefined>) => string;
  /** Null when the user may not manage procedures. */
  procedures: string | null;
};

const linkClass =
  'font-medium text-plumb-700 underline decoration-plumb-300 underline-offset-2 hover:text-plumb-900';

function Card({ title, children, footer }: { title: string; children: ReactNode; footer?: ReactNode }) {
  return (
    <section
      aria-label={title}
      className="flex flex-col rounded-lg border border-slate-200 bg-white p-5 shadow-xs"
    >
      <h2 className="text-xs font-semibold tracking-[0.12em] text-slate-500 uppercase">{title}</h2>
      <div className="mt-3 flex-1">{children}</div>
      {footer ? <div className="mt-4 text-sm">{footer}</div> : null}
    </section>
  );
}

function deadlineText(days: number): string {
  if (days < 0) return `${-days} day${days === -1 ? '' : 's'} past the deadline`;
  if (days === 0) return 'due today';
  return `${days} day${days === 1 ? '' : 's'} left`;
}

function CurrentPeriod({ overview, links }: { overview: LabOverview; links: OverviewLinks }) {
  const current = overview.currentPeriod;
  if (!current) {
    return (
      <Card title="This period">
        <p className="text-sm text-slate-700">The network has not opened a monthly period yet.</p>
      </Card>
    );
  }
  const stateLabel = { open: 'Open', closed: 'Closed', published: 'Published' }[current.state];
  return (
    <Card
      title="This period"
      footer={
        <Link
          to={current.submitted ? links.report({ period: current.period }) : links.uploads}
          className={linkClass}
        >
          {current.submitted
            ? `Open the report of ${formatPeriod(current.period)}`
            : 'Upload the control data'}
        </Link>
      }
    >
      <p className="flex flex-wrap items-center gap-2">
        <span className="text-xl font-semibold text-plumb-950">{formatPeriod(current.period)}</span>
        <Badge tone={current.state === 'open' ? 'plumb' : 'neutral'}>{stateLabel}</Badge>
        {current.late ? <Badge tone="alarm">Late</Badge> : null}
      </p>
      <dl className="mt-3 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1.5 text-sm">
        <dt className="text-slate-500">Deadline</dt>
        <dd className="text-slate-900">
          <time dateTime={current.deadline}>{formatDate(current.deadline)}</time>
          {current.state === 'open' ? (
            <span
              className={`ml-1 ${current.daysToDeadline < 0 ? 'font-semibold text-alarm-800' : current.daysToDeadline < 7 ? 'font-medium text-brass-700' : 'text-slate-600'}`}
            >
              ({deadlineText(current.daysToDeadline)})
            </span>
          ) : null}
        </dd>
        <dt className="text-slate-500">Your data</dt>
        <dd className={current.submitted ? 'text-plumb-800' : 'font-medium text-brass-700'}>
          {current.submitted ? 'Submitted' : 'Not submitted yet'}
        </dd>
        <dt className="text-slate-500">Sign-off</dt>
        <dd className="text-slate-900">
          {current.signoff
            ? `Signed by ${current.signoff.signedBy.name}, ${formatDate(current.signoff.signedAt)}`
            : 'Not signed'}
        </dd>
      </dl>
    </Card>
  );
}

function FlagSummary({ overview, links }: { overview: LabOverview; links: OverviewLinks }) {
  const flags = overview.flags;
  if (!flags) {
    return (
      <Card title="Flags">
        <p className="text-sm text-slate-700">No report yet: your lab has no stored results.</p>
      </Card>
    );
  }
  const order: Severity[] = ['action', 'warning', 'acceptable', 'fine'];
  const needsLook = flags.rowsBySeverity.action + flags.rowsBySeverity.warning;
  return (
    <Card
      title={`Flags in ${formatPeriod(flags.period)}`}
      footer={
        needsLook > 0 ? (
          <Link to={links.report({ period: flags.period, flagged: '1' })} className={linkClass}>
            Review the {needsLook} flagged result{needsLook === 1 ? '' : 's'}
          </Link>
        ) : (
          <Link to={links.report({ period: flags.period })} className={linkClass}>
            Open the report
          </Link>
        )
      }
    >
      <p className="text-xs text-slate-600">
        {flags.rows} results · {flags.published ? 'published figures' : 'provisional figures'} · each result
        counted by its worst flag
      </p>
      <dl className="mt-3 grid grid-cols-2 gap-2">
        {order.map((severity) => (
          <div key={severity} className="rounded-md bg-slate-50 px-3 py-2">
            <dt className="flex items-center gap-1.5 text-xs text-slate-600">
              <SeverityIcon severity={severity} />
              {severityLabels[severity]}
            </dt>
            <dd className="figures text-xl font-semibold text-slate-900">{flags.rowsBySeverity[severity]}</dd>
          </div>
        ))}
      </dl>
    </Card>
  );
}

const attentionSeverity: Record<AttentionItem['severity'], Severity> = {
  info: 'fine',
  warning: 'warning',
  action: 'action',
};
const attentionWords: Record<AttentionItem['severity'], string> = {
  info: 'For information',
  warning: 'Warning',
  action: 'Action',
};

function attentionLink(item: AttentionItem, links: OverviewLinks): { to: string; label: string } | null {
  switch (item.kind) {
    case 'data-due':
    case 'missing-data':
    case 'upload-needs-review':
    case 'upload-failed':
      return { to: links.uploads, label: 'Go to uploads' };
    case 'no-procedures':
      return links.procedures ? { to: links.procedures, label: 'Register procedures' } : null;
    case 'unsigned-period':
    case 'rows-not-computable':
    case 'shift-detected':
      return { to: links.report({ period: item.period ?? undefined }), label: 'Open the report' };
    case 'action-flags':
    case 'warning-flags':
      return {
        to: links.report({ period: item.period ?? undefined, flagged: '1' }),
        label: 'See the flagged results',
      };
  }
}

function Attention({ overview, links }: { overview: LabOverview; links: OverviewLinks }) {
  return (
    <Card title="Needs attention">
      {overview.attention.length === 0 ? (
        <p className="text-sm text-slate-700">
          Nothing waits for you. Your data is in and no result needs a look.
        </p>
      ) : (
        <ul className="divide-y divide-slate-100" aria-label="Things to do, most urgent first">
          {overview.attention.map((item, index) => {
            const link = attentionLink(item, links);
            return (
              <li key={`${item.kind}-${index}`} className="flex items-start gap-3 py-2.5">
                <span className="mt-1">
                  <SeverityIcon severity={attentionSeverity[item.severity]} size={13} />
                </span>
                <div className="flex-1 text-sm">
                  <p className="text-slate-900">
                    <span className="sr-only">{attentionWords[item.severity]}: </span>
                    {item.message}
                  </p>
                  {link ? (
                    <Link to={link.to} className={`mt-0.5 inline-block text-xs ${linkClass}`}>
                      {link.label}
                    </Link>
                  ) : null}
                </div>
                <span
                  className={`text-xs whitespace-nowrap ${item.severity === 'action' ? 'font-semibold text-alarm-800' : item.severity === 'warning' ? 'text-brass-700' : 'text-slate-500'}`}
                  aria-hidden="true"
                >
                  {attentionWords[item.severity]}
                </span>
              </li>
            );
          })}
        </ul>
      )}
    </Card>
  );
}

const uploadStatusWords: Record<UploadSummary['status'], string> = {
  queued: 'Waiting to be checked',
  processing: 'Being checked',
  'needs-review': 'Waiting for your decision',
  stored: 'Stored',
  failed: 'Could not be read',
  cancelled: 'Cancelled',
};

function UploadsCsvButton({ labId }: { labId: string }) {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="ghost"
      size="xs"
      isLoading={busy}
      onClick={async () => {
        setBusy(true);
        try {
          await downloadUploadsCsv(labId);
        } catch (error) {
          showToast(`The uploads could not be downloaded: ${errorMessage(error)}`, 'error');
        } finally {
          setBusy(false);
        }
      }}
    >
      Every upload as CSV
    </Button>
  );
}

function RecentUploads({
  labId,
  uploads,
  links,
}: {
  labId: string;
  uploads: readonly UploadSummary[];
  links: OverviewLinks;
}) {
  return (
    <Card
      title="Recent uploads"
      footer={
        <span className="flex flex-wrap items-center justify-between gap-2">
          <Link to={links.uploads} className={linkClass}>
            All uploads
          </Link>
          {uploads.length > 0 ? <UploadsCsvButton labId={labId} /> : null}
        </span>
      }
    >
      {uploads.length === 0 ? (
        <p className="text-sm text-slate-700">No file has been uploaded yet.</p>
      ) : (
        <table className="w-full text-sm">
          <caption className="sr-only">The lab's latest uploads</caption>
          <thead>
            <tr className="border-b border-slate-200 text-left text-xs text-slate-500">
              <th scope="col" className="py-1.5 pr-2 font-medium">
                File
              </th>
              <th scope="col" className="py-1.5 pr-2 font-medium">
                Status
              </th>
              <th scope="col" className="py-1.5 pr-2 text-right font-medium">
                Rows stored
              </th>
              <th scope="col" className="py-1.5 text-right font-medium">
                Sent
              </th>
            </tr>
          </thead>
          <tbody>
            {uploads.map((upload) => (
              <tr key={upload.id} className="border-b border-slate-100">
                <th
                  scope="row"
                  className="max-w-[14rem] truncate py-1.5 pr-2 text-left font-medium text-slate-900"
                  title={upload.filename}
                >
                  {upload.filename}
                  <span className="block text-xs font-normal text-slate-500">
                    {uploadKindWords[upload.kind]}
                  </span>
                </th>
                <td className="py-1.5 pr-2">
                  <Badge
                    tone={
                      upload.status === 'stored'
                        ? 'plumb'
                        : upload.status === 'failed'
                          ? 'alarm'
                          : upload.status === 'needs-review'
                            ? 'brass'
                            : 'neutral'
                    }
                  >
                    {uploadStatusWords[upload.status]}
                  </Badge>
                </td>
                <td className="py-1.5 pr-2 text-right">
                  {upload.rowsAccepted} of {upload.rowsTotal}
                </td>
                <td className="py-1.5 text-right text-xs whitespace-nowrap text-slate-600">
                  {formatDateTime(upload.createdAt)}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </Card>
  );
}

export function LabOverviewDashboard({ labId, links }: { labId: string; links: OverviewLinks }) {
  const overview = useQuery(labOverviewKeys.overview(labId));
  if (overview.isPending) return <Spinner label="Loading your lab's overview" />;
  if (overview.isError) {
    return (
      <Alert tone="error" title="The overview could not be loaded">
        {errorMessage(overview.error)}
      </Alert>
    );
  }
  const data = overview.data;
  return (
    <div className="grid gap-5 md:grid-cols-2">
      <CurrentPeriod overview={data} links={links} />
      <FlagSummary overview={data} links={links} />
      <div className="md:col-span-2">
        <Attention overview={data} links={links} />
      </div>
      <div className="md:col-span-2">
        <RecentUploads labId={labId} uploads={data.recentUploads} links={links} />
      </div>
    </div>
  );
}
