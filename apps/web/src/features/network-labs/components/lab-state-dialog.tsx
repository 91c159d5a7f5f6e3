// Deactivating a lab (its users can no longer sign in; its data stays) or reactivating it, after a confirmation.
import type { LabListItem } from '@plumbline/contracts';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { useDeactivateLab, useEditLab } from '../api/save-lab.ts';

export type LabStateRequest = { lab: LabListItem; action: 'deactivate' | 'reactivate' } | null;

export function LabStateDialog({ request, onClose }: { request: LabStateRequest; onClose: () => void }) {
  const deactivate = useDeactivateLab();
  const reactivate = useEditLab();
  const mutation = request?.action === 'reactivate' ? reactivate : deactivate;
  const close = () => {
    deactivate.reset();
    reactivate.reset();
    onClose();
  };
  const lab = request?.lab;
  const deactivating = request?.action === 'deactivate';
  const label = lab ? `${lab.code} · ${lab.name}` : '';

  return (
    <ConfirmDialog
      open={request !== null}
      onClose={close}
      title={deactivating ? `Deactivate lab ${lab?.code ?? ''}?` : `Reactivate lab ${lab?.code ?? ''}?`}
      confirmLabel={deactivating ? 'Deactivate lab' : 'Reactivate lab'}
      tone={deactivating ? 'danger' : 'primary'}
      reason="optional"
      isPending={mutation.isPending}
      error={mutation.error ? errorMessage(mutation.error) : null}
      onConfirm={(reason) => {
        if (!lab) return;
        const onSuccess = () => {
          showToast(`Lab ${lab.code} ${deactivating ? 'deactivated' : 'reactivated'}.`);
          close();
        };
        if (deactivating) deactivate.mutate({ labId: lab.id, reason }, { onSuccess });
        else
          reactivate.mutate(
            { labId: lab.id, body: { active: true, reason: reason || undefined } },
            { onSuccess },
          );
      }}
    >
      {deactivating ? (
        <>
          <p>
            <strong className="font-semibold text-slate-900">{label}</strong> leaves the network&rsquo;s
            active labs: its users can no longer sign in and its open invitations can no longer be accepted.
          </p>
          <p>Its data stays, and you can reactivate the lab later.</p>
        </>
      ) : (
        <p>
          <strong className="font-semibold text-slate-900">{label}</strong> becomes an active member again;
          its users can sign in as before.
        </p>
      )}
    </ConfirmDialog>
  );
}
