// Enrol a lab or edit one: its de-identifying code, its name and the units its reports use.
// Validated with the contract's labCreateSchema / labUpdateSchema; a taken code comes back as 409.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import { labCreateSchema, labUpdateSchema, type LabListItem } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, errorMessage, formAlertMessage } from '../../../lib/form-errors.ts';
import { networkLabsKeys, type LabSettings } from '../api/network-labs-keys.ts';
import { useEditLab, useEnrolLab } from '../api/save-lab.ts';

type FormValues = { code: string; name: string; preferredUnits: 'si' | 'conventional'; reason: string };
const fieldNames = ['code', 'name', 'preferredUnits', 'reason'];

export type LabFormState = { mode: 'enrol' } | { mode: 'edit'; lab: LabListItem } | null;

export function LabFormDialog({ state, onClose }: { state: LabFormState; onClose: () => void }) {
  const editing = state?.mode === 'edit' ? state.lab : null;
  return (
    <Dialog
      open={state !== null}
      onClose={onClose}
      title={editing ? `Edit lab ${editing.code}` : 'Enrol a lab'}
      description={
        editing
          ? undefined
          : 'Other labs only ever see the code, so choose one that does not reveal who the lab is.'
      }
    >
      {editing ? <EditLab lab={editing} onDone={onClose} /> : <LabForm settings={null} onDone={onClose} />}
    </Dialog>
  );
}

function EditLab({ lab, onDone }: { lab: LabListItem; onDone: () => void }) {
  const settings = useQuery(networkLabsKeys.lab(lab.id));
  if (settings.isPending) return <PageLoading />;
  if (settings.isError) {
    return (
      <Alert tone="error" title="The lab could not be loaded">
        {errorMessage(settings.error)}
      </Alert>
    );
  }
  return <LabForm settings={settings.data} onDone={onDone} />;
}

function LabForm({ settings, onDone }: { settings: LabSettings | null; onDone: () => void }) {
  const enrol = useEnrolLab();
  const edit = useEditLab();
  const mutation = settings ? edit : enrol;
  const schema = settings ? labUpdateSchema : labCreateSchema;
  const form = useForm<FormValues, unknown, z.output<typeof labUpdateSchema>>({
    resolver: zodResolver(schema as unknown as z.ZodType<z.output<typeof labUpdateSchema>, FormValues>),
    defaultValues: {
      code: settings?.code ?? '',
      name: settings?.name ?? '',
      preferredUnits: settings?.preferredUnits ?? 'si',
      reason: '',
    },
  });
  const { errors } = form.formState;

  const onSubmit = form.handleSubmit((values) => {
    const onError = (error: unknown) => applyServerFieldErrors(error, form.setError, fieldNames);
    if (settings) {
      edit.mutate(
        { labId: settings.id, body: values },
        {
          onSuccess: (lab) => {
            showToast(`Lab ${lab.code} saved.`);
            onDone();
          },
          onError,
        },
      );
    } else {
      enrol.mutate(
        { code: values.code ?? '', name: values.name ?? '', preferredUnits: values.preferredUnits },
        {
          onSuccess: (lab) => {
            showToast(`Lab ${lab.code} enrolled. Invite its first users from its user list.`);
            onDone();
          },
          onError,
        },
      );
    }
  });

  return (
    <form noValidate onSubmit={onSubmit}>
      {mutation.error ? (
        <div className="mb-5">
          <Alert tone="error" title="Not saved">
            {formAlertMessage(mutation.error, fieldNames)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-[10rem_1fr]">
        <TextField
          label="Lab code"
          hint="2 to 20 letters, digits or hyphens."
          spellCheck={false}
          error={errors.code?.message}
          {...form.register('code')}
        />
        <TextField
          label="Lab name"
          hint="Only you see it."
          error={errors.name?.message}
          {...form.register('name')}
        />
        <SelectField
          className="sm:col-span-2"
          label="Units in the lab's reports"
          error={errors.preferredUnits?.message}
          {...form.register('preferredUnits')}
        >
          <option value="si">SI units</option>
          <option value="conventional">Conventional units</option>
        </SelectField>
        {settings ? (
          <TextareaField
            className="sm:col-span-2"
            label="Reason for the change, optional"
            hint="Kept in the audit log with the change."
            error={errors.reason?.message}
            {...form.register('reason')}
          />
        ) : null}
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
        <Button type="submit" isLoading={mutation.isPending}>
          {settings ? 'Save changes' : 'Enrol lab'}
        </Button>
      </DialogActions>
    </form>
  );
}
