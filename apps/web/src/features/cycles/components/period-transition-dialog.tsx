// Closing a period (later uploads are marked late) and reopening a closed one (needs a reason),
// after a confirmation.
import type { Period } from '@plumbline/contracts';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { useClosePeriod, useReopenPeriod } from '../api/period-actions.ts';

export type PeriodTransition = { period: Period; action: 'close' | 'reopen' } | null;

export function PeriodTransitionDialog({
  request,
  onClose,
}: {
  request: PeriodTransition;
  onClose: () => void;
}) {
  const close = useClosePeriod();
  const reopen = useReopenPeriod();
  const closing = request?.action === 'close';
  const mutation = closing ? close : reopen;
  const name = request ? formatPeriod(request.period.period) : '';
  const dismiss = () => {
    close.reset();
    reopen.reset();
    onClose();
  };
  return (
    <ConfirmDialog
      open={request !== null}
      onClose={dismiss}
      title={closing ? `Close ${name}?` : `Reopen ${name}?`}
      confirmLabel={closing ? 'Close period' : 'Reopen period'}
      tone={closing ? 'danger' : 'primary'}
      reason={closing ? 'optional' : 'required'}
      reasonLabel={
        closing ? 'Reason (kept in the audit log)' : 'Why is the period reopened? (kept in the audit log)'
      }
      isPending={mutation.isPending}
      error={mutation.error ? errorMessage(mutation.error) : null}
      onConfirm={(reason) => {
        if (!request) return;
        mutation.mutate(
          { period: request.period.period, reason },
          {
            onSuccess: () => {
              showToast(closing ? `${name} is closed; later data is marked late.` : `${name} is open again.`);
              dismiss();
            },
          },
        );
      }}
    >
      {closing ? (
        <p>
          Labs can still send data for {name}, but anything that arrives from now on is marked late on the
          participation board and in their reports. You can reopen the period until it is published.
        </p>
      ) : (
        <p>
          {name} takes submissions on time again until it is closed once more. Data already marked late stays
          marked.
        </p>
      )}
    </ConfirmDialog>
  );
}
