// One result of the peer report in depth (journey 3): trend, peer distribution, two-level plot,
// control chart with multirule results, measurement uncertainty, and the corrective-action comments.
import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link, useParams, useSearchParams } from 'react-router-dom';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { paths } from '../../../config/paths.ts';
import { labReviewKeys, type DrilldownParams } from '../../../features/lab-review/api/lab-review-keys.ts';
import { DrilldownView } from '../../../features/lab-review/components/drilldown-view.tsx';
import { qcInsightKeys } from '../../../features/qc-insight/api/qc-insight-keys.ts';
import {
  eventKindLabels,
  ProcedureInsightPanel,
} from '../../../features/qc-insight/components/procedure-insight-panel.tsx';
import { RowComments } from '../../../features/lab-review/components/row-comments.tsx';
import { SignedBanner } from '../../../features/lab-review/components/signoff-panel.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { useSession } from '../../../lib/auth.tsx';
import { formatPeriod } from '../../../utils/format.ts';

export default function ReportRowRoute() {
  const session = useSession();
  const params = useParams();
  const [search, setSearch] = useSearchParams();
  const labId = session?.user.labId ?? null;
  const period = search.get('period') ?? '';
  const unitsParam = search.get('units');
  const level = Number(params.level);
  // Shown at once from state; the URL (kept for reloads and links) follows in a transition.
  const [target, setTarget] = useState<'lab' | 'peer'>(search.get('target') === 'peer' ? 'peer' : 'lab');
  const drilldownParams: DrilldownParams = {
    labId: labId ?? '',
    procedureId: params.procedureId ?? '',
    controlLotId: params.controlLotId ?? '',
    level,
    period,
    target,
    units: unitsParam === 'si' || unitsParam === 'conventional' ? unitsParam : undefined,
  };
  const valid = labId !== null && /^\d{4}-\d{2}$/.test(period) && Number.isInteger(level);
  const drilldown = useQuery({ ...labReviewKeys.drilldown(drilldownParams), enabled: valid });
  const comments = useQuery({ ...labReviewKeys.comments(labId ?? '', period), enabled: valid });
  const signoff = useQuery({ ...labReviewKeys.signoff(labId ?? '', period), enabled: valid });
  const events = useQuery({
    ...qcInsightKeys.events(labId ?? '', drilldownParams.procedureId),
    enabled: valid,
  });
  const backHref = `${paths.lab.peerReport.getHref()}${search.get('back') ? `?${search.get('back')}` : `?period=${encodeURIComponent(period)}`}`;
  const backLink = (
    <Link
      to={backHref}
      className="inline-flex h-9 items-center rounded-md px-3 text-sm font-medium text-plumb-800 ring-1 ring-plumb-200 ring-inset hover:bg-plumb-50"
    >
      <span aria-hidden="true">←&nbsp;</span>Back to the report
    </Link>
  );

  if (!session || !valid) {
    return (
      <ContentLayout title="Result details" area="Peer report" actions={backLink}>
        <EmptyState
          title="This link does not name a result of your lab"
          description="Open a result from the peer report: the link carries the procedure, control lot, level and period."
        />
      </ContentLayout>
    );
  }

  const data = drilldown.data;
  const title = data ? `${data.analyte.name}, level ${data.level}` : 'Result details';
  const rowComments = (comments.data ?? []).filter(
    (c) =>
      c.procedure.id === drilldownParams.procedureId &&
      c.controlLot.id === drilldownParams.controlLotId &&
      c.level === level,
  );
  const signed = signoff.data?.signoff ?? null;

  return (
    <ContentLayout
      title={title}
      area={`Peer report · ${formatPeriod(period)}`}
      width="wide"
      description={
        data
          ? `Procedure ${data.procedure.code} · control lot ${data.controlLot.lotNumber} · level ${data.level}`
          : undefined
      }
      actions={backLink}
    >
      {drilldown.isError ? (
        <Alert tone="error" title="The details of this result could not be loaded">
          {errorMessage(drilldown.error)}
        </Alert>
      ) : !data ? (
        <Spinner label="Loading the charts" />
      ) : (
        <div className="space-y-10">
          {signed ? <SignedBanner signoff={signed} /> : null}
          <DrilldownView
            drilldown={data}
            params={drilldownParams}
            events={(events.data ?? []).map((e) => ({
              day: e.occurredOn,
              label: `${eventKindLabels[e.kind]} on ${e.occurredOn}${e.note ? ` (${e.note})` : ''}`,
            }))}
            onTargetChange={(nextTarget) => {
              setTarget(nextTarget);
              const next = new URLSearchParams(search);
              next.set('target', nextTarget);
              setSearch(next, { replace: true });
            }}
          />
          <ProcedureInsightPanel
            labId={drilldownParams.labId}
            procedureId={drilldownParams.procedureId}
            controlLotId={drilldownParams.controlLotId}
            level={level}
            canRecord={session.user.role === 'analyst' || session.user.role === 'supervisor'}
          />
          <RowComments
            labId={drilldownParams.labId}
            period={period}
            row={{
              procedureId: drilldownParams.procedureId,
              controlLotId: drilldownParams.controlLotId,
              level,
            }}
            comments={rowComments}
            signed={signed !== null}
            currentUser={{ id: session.user.id, role: session.user.role }}
          />
        </div>
      )}
    </ContentLayout>
  );
}
