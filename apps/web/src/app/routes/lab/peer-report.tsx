// The lab's peer report (journey 3): the period's table with flags, filters and downloads, the
// comments under the rows they are about, and the monthly sign-off. Period, units and filters live in
// the URL, so coming back from a row's details keeps them.
import { useCallback, useMemo, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import type { Comment, PeerReport, PeerReportRow, UnitSystem } from '@plumbline/contracts';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { paths } from '../../../config/paths.ts';
import { labReviewKeys } from '../../../features/lab-review/api/lab-review-keys.ts';
import { CommentsCsvButton } from '../../../features/lab-review/components/comments-csv-button.tsx';
import { SignoffPanel } from '../../../features/lab-review/components/signoff-panel.tsx';
import { peerReportKeys } from '../../../features/peer-report/api/peer-report-keys.ts';
import {
  PeerReportView,
  type ReportChoice,
} from '../../../features/peer-report/components/peer-report-view.tsx';
import type { RowNote } from '../../../features/peer-report/components/report-table.tsx';
import { defaultReportPeriod } from '../../../features/peer-report/utils/default-period.ts';
import {
  isFlagged,
  keyOfRow,
  reportRowKey,
  type Severity,
} from '../../../features/peer-report/utils/report-rows.ts';
import { useSession, useUser } from '../../../lib/auth.tsx';

const severities = new Set<string>(['fine', 'acceptable', 'warning', 'action']);

function choiceFromSearch(search: URLSearchParams): ReportChoice {
  const units = search.get('units');
  const severity = search.get('severity') ?? '';
  return {
    period: search.get('period'),
    units: units === 'si' || units === 'conventional' ? (units as UnitSystem) : null,
    filters: {
      flaggedOnly: search.get('flagged') === '1',
      analyte: search.get('analyte') ?? '',
      severity: severities.has(severity) ? (severity as Severity) : '',
    },
  };
}

function definedEntries(record: Record<string, string | undefined>): [string, string][] {
  return Object.entries(record).filter((entry): entry is [string, string] => Boolean(entry[1]));
}

function searchFromChoice(choice: ReportChoice): Record<string, string | undefined> {
  return {
    period: choice.period ?? undefined,
    units: choice.units ?? undefined,
    flagged: choice.filters.flaggedOnly ? '1' : undefined,
    analyte: choice.filters.analyte || undefined,
    severity: choice.filters.severity || undefined,
  };
}

function notesByRow(comments: readonly Comment[] | undefined): Map<string, RowNote> {
  const notes = new Map<string, RowNote>();
  for (const comment of comments ?? []) {
    const key = reportRowKey({
      procedureId: comment.procedure.id,
      controlLotId: comment.controlLot.id,
      level: comment.level,
    });
    const note = notes.get(key) ?? { count: 0, latest: null };
    // Comments come oldest first: the last one seen is the latest.
    notes.set(key, {
      count: note.count + 1,
      latest: { body: comment.body, author: comment.author.name, createdAt: comment.createdAt },
    });
  }
  return notes;
}

export default function PeerReportRoute() {
  const session = useSession();
  const user = useUser();
  const [search, setSearch] = useSearchParams();
  const labId = session?.user.labId ?? null;
  // The choice shows at once from state; the URL follows (it is what brings it back after a row's
  // details), updated in a transition that may land a moment later.
  const [choice, setChoice] = useState(() => choiceFromSearch(search));
  const periods = useQuery(peerReportKeys.periods());
  const period = choice.period ?? defaultReportPeriod(periods.data ?? []);
  const comments = useQuery({
    ...labReviewKeys.comments(labId ?? '', period ?? ''),
    enabled: labId !== null && period !== null,
  });
  const notes = useMemo(() => notesByRow(comments.data), [comments.data]);

  const onChoiceChange = useCallback(
    (next: ReportChoice) => {
      setChoice(next);
      setSearch(new URLSearchParams(definedEntries(searchFromChoice(next))), { replace: true });
    },
    [setSearch],
  );
  const detailHref = useCallback(
    (row: PeerReportRow, rowPeriod: string) =>
      paths.lab.reportRow.getHref(
        { procedureId: row.procedure.id, controlLotId: row.controlLot.id, level: row.level },
        {
          period: rowPeriod,
          units: choice.units ?? undefined,
          // The way back: this period, units and filters.
          back: new URLSearchParams(
            definedEntries(searchFromChoice({ ...choice, period: rowPeriod })),
          ).toString(),
        },
      ),
    [choice],
  );

  if (!session || !labId) {
    return (
      <ContentLayout title="Peer report" area="My lab">
        <EmptyState
          title="Your account belongs to no lab"
          description="The peer report is kept per member lab. Ask your network coordinator to add your account to your lab."
        />
      </ContentLayout>
    );
  }

  const review = (reviewPeriod: string, report: PeerReport) => {
    const flaggedWithoutComment = report.rows.filter(
      (row) => isFlagged(row) && !notes.has(keyOfRow(row)),
    ).length;
    return (
      <SignoffPanel
        labId={labId}
        period={reviewPeriod}
        canSign={session.user.role === 'supervisor'}
        flaggedWithoutComment={flaggedWithoutComment}
      />
    );
  };

  return (
    <ContentLayout
      title="Peer report"
      area={user.data?.lab ? `Lab ${user.data.lab.code}` : 'My lab'}
      width="wide"
      description="Your lab’s monthly figures beside its peer group’s, per measurement procedure, control lot and level: SDI, CVR, bias, sigma and flags. Open a result for its charts and to document corrective action."
    >
      <PeerReportView
        labId={labId}
        labCode={user.data?.lab?.code}
        choice={{ ...choice, period }}
        onChoiceChange={onChoiceChange}
        detailHref={detailHref}
        notes={notes}
        review={review}
        downloads={(downloadPeriod) => <CommentsCsvButton labId={labId} period={downloadPeriod} />}
      />
    </ContentLayout>
  );
}
