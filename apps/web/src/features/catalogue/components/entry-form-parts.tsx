// Pieces every catalogue form shares: the reason field of an edit, the server's answer, the buttons,
// and what happens after saving (toast, close) or failing (errors beside fields, the rest on top).
import type { FieldValues, UseFormSetError } from 'react-hook-form';
import type { CatalogueList } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { DialogActions } from '../../../components/ui/dialog.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, formAlertMessage } from '../../../lib/form-errors.ts';
import { useSaveCatalogueEntry } from '../api/save-catalogue-entry.ts';
import { catalogueListLabels } from '../utils/list-labels.ts';

export function FormError({ message }: { message: string | null }) {
  if (!message) return null;
  return (
    <div className="mb-5">
      <Alert tone="error" title="Not saved">
        {message}
      </Alert>
    </div>
  );
}

export function EntryFormActions({
  onCancel,
  isPending,
  isEdit,
}: {
  onCancel: () => void;
  isPending: boolean;
  isEdit: boolean;
}) {
  return (
    <DialogActions>
      <Button variant="secondary" onClick={onCancel}>
        Cancel
      </Button>
      <Button type="submit" isLoading={isPending}>
        {isEdit ? 'Save changes' : 'Create'}
      </Button>
    </DialogActions>
  );
}

/**
 * Saves the form's values; on success says so and closes; on failure puts the API's field errors
 * beside their fields and returns the sentence to show above the form.
 */
export function useEntrySubmit<T extends FieldValues>(
  list: CatalogueList,
  options: {
    id?: string;
    fieldNames: readonly string[];
    setError: UseFormSetError<T>;
    onSaved: () => void;
  },
) {
  const save = useSaveCatalogueEntry(list);
  const submit = (body: Record<string, unknown>, name: string) =>
    save.mutate(
      { id: options.id, body },
      {
        onSuccess: () => {
          const singular = catalogueListLabels[list].singular;
          const label = singular.charAt(0).toUpperCase() + singular.slice(1);
          showToast(`${label} ${name} ${options.id ? 'saved' : 'created'}.`);
          options.onSaved();
        },
        onError: (error) => {
          applyServerFieldErrors(error, options.setError, options.fieldNames);
        },
      },
    );
  const message = save.error ? formAlertMessage(save.error, options.fieldNames) : null;
  return { submit, isPending: save.isPending, message };
}
