// The period's corrective-action comments as CSV (GET /api/labs/:labId/comments.csv).
import { useState } from 'react';
import { Button } from '../../../components/ui/button.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { downloadCommentsCsv } from '../api/review-downloads.ts';

export function CommentsCsvButton({ labId, period }: { labId: string; period: string }) {
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      size="sm"
      isLoading={busy}
      onClick={async () => {
        setBusy(true);
        try {
          await downloadCommentsCsv(labId, period);
        } catch (error) {
          showToast(`The comments could not be downloaded: ${errorMessage(error)}`, 'error');
        } finally {
          setBusy(false);
        }
      }}
    >
      Comments CSV
    </Button>
  );
}
