// The lab's uploads page: send a file (journey 1), see this period's report refresh once it is
// stored, and look back at every file the lab has sent.
import { useCallback, useState } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { ContentLayout } from '../../../components/layouts/content-layout.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { peerReportKeys } from '../../../features/peer-report/api/peer-report-keys.ts';
import { PeriodReportSummary } from '../../../features/peer-report/components/period-report-summary.tsx';
import { UploadDetails } from '../../../features/uploads/components/upload-details.tsx';
import { UploadHistory } from '../../../features/uploads/components/upload-history.tsx';
import { UploadJourney } from '../../../features/uploads/components/upload-journey.tsx';
import { useSession } from '../../../lib/auth.tsx';

export default function UploadsRoute() {
  const session = useSession();
  const queryClient = useQueryClient();
  const labId = session?.user.labId ?? null;
  /** Null: the period the lab is most likely working on. */
  const [reportPeriod, setReportPeriod] = useState<string | null>(null);
  const [selectedUploadId, setSelectedUploadId] = useState<string | null>(null);

  // New data changes the lab's report: show the file's month and fetch the report again.
  const onStored = useCallback(
    (periods: string[]) => {
      if (periods.length > 0) setReportPeriod(periods[periods.length - 1]);
      void queryClient.invalidateQueries({ queryKey: peerReportKeys.details() });
    },
    [queryClient],
  );
  const onStoredFromHistory = useCallback(() => onStored([]), [onStored]);

  if (!labId) {
    return (
      <ContentLayout title="Uploads" area="My lab">
        <EmptyState
          title="Your account belongs to no lab"
          description="Control data is uploaded for a member lab. Ask your network coordinator to add your account to your lab."
        />
      </ContentLayout>
    );
  }

  return (
    <ContentLayout
      title="Uploads"
      area="My lab"
      description="Send your lab’s control data as a monthly summary or as daily values. Each file is checked row by row; nothing is stored until it passes or you decide."
    >
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_21rem]">
        <UploadJourney onStored={onStored} />
        <PeriodReportSummary labId={labId} period={reportPeriod} onPeriodChange={setReportPeriod} />
      </div>
      <div className="mt-10 space-y-6">
        <UploadHistory labId={labId} selectedId={selectedUploadId} onSelect={setSelectedUploadId} />
        {selectedUploadId ? (
          <UploadDetails
            uploadId={selectedUploadId}
            onClose={() => setSelectedUploadId(null)}
            onStored={onStoredFromHistory}
          />
        ) : null}
      </div>
    </ContentLayout>
  );
}
