// CSV and PDF of the report, fetched with the session's token and saved by the browser.
import { useState } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import type { PeerReportParams } from '../api/peer-report-keys.ts';
import { downloadReportFile, type ReportFileKind } from '../api/report-downloads.ts';

export function ReportDownloadButtons({ params, labCode }: { params: PeerReportParams; labCode?: string }) {
  const [busy, setBusy] = useState<ReportFileKind | null>(null);
  const download = async (kind: ReportFileKind) => {
    setBusy(kind);
    try {
      await downloadReportFile(params, kind, labCode);
    } catch (error) {
      showToast(`The ${kind.toUpperCase()} could not be downloaded: ${errorMessage(error)}`, 'error');
    } finally {
      setBusy(null);
    }
  };
  return (
    <div className="flex gap-2">
      <Button variant="secondary" size="sm" isLoading={busy === 'csv'} onClick={() => void download('csv')}>
        Report CSV
      </Button>
      <Button variant="secondary" size="sm" isLoading={busy === 'pdf'} onClick={() => void download('pdf')}>
        Monthly report (PDF)
      </Button>
    </div>
  );
}
