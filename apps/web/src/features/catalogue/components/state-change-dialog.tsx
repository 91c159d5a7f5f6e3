// Retire (hide from new use, keep for the data that refers to it) or restore one entry, after a confirmation.
import type { CatalogueList } from '@plumbline/contracts';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { useChangeCatalogueState } from '../api/change-catalogue-state.ts';
import type { CatalogueItem } from '../api/catalogue-keys.ts';
import { catalogueListLabels, entryName } from '../utils/list-labels.ts';

export type StateChangeRequest = { entry: CatalogueItem; action: 'retire' | 'restore' } | null;

export function StateChangeDialog({
  list,
  request,
  onClose,
}: {
  list: CatalogueList;
  request: StateChangeRequest;
  onClose: () => void;
}) {
  const change = useChangeCatalogueState(list);
  const singular = catalogueListLabels[list].singular;
  const name = request ? entryName(request.entry) : '';
  const retire = request?.action === 'retire';
  const close = () => {
    change.reset();
    onClose();
  };
  return (
    <ConfirmDialog
      open={request !== null}
      onClose={close}
      title={retire ? `Retire ${singular} ${name}?` : `Restore ${singular} ${name}?`}
      confirmLabel={retire ? 'Retire' : 'Restore'}
      tone={retire ? 'danger' : 'primary'}
      reason="optional"
      isPending={change.isPending}
      error={change.error ? errorMessage(change.error) : null}
      onConfirm={(reason) => {
        if (!request) return;
        change.mutate(
          { id: request.entry.id, action: request.action, reason },
          {
            onSuccess: () => {
              showToast(`${name} ${retire ? 'retired' : 'restored'}.`);
              close();
            },
          },
        );
      }}
    >
      {retire ? (
        <p>
          A retired {singular} can no longer be chosen for new procedures or lots. Nothing is deleted: data
          that refers to <strong className="font-semibold text-slate-900">{name}</strong> keeps it, and you
          can restore it at any time.
        </p>
      ) : (
        <p>
          <strong className="font-semibold text-slate-900">{name}</strong> becomes available again for new
          procedures and lots.
        </p>
      )}
    </ConfirmDialog>
  );
}
