// Create a period or move its deadline. The deadline is entered in local time and checked with the
// contract schema (and by the API: it must fall after the month has ended).
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { periodCreateSchema, periodUpdateSchema, type Period } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, formAlertMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { useChangeDeadline, useCreatePeriod } from '../api/period-actions.ts';
import { isoToLocalDateTime, localDateTimeToIso, usualDeadline } from '../utils/period-dates.ts';

/** The contract schemas, reading the deadline from a datetime-local input. */
const deadlineInput = z.preprocess(localDateTimeToIso, periodCreateSchema.shape.deadline);
export const periodCreateFormSchema = periodCreateSchema.extend({ deadline: deadlineInput });
const periodUpdateFormSchema = periodUpdateSchema.extend({ deadline: deadlineInput });

type FormValues = { period: string; deadline: string; reason: string };
const fieldNames = ['period', 'deadline', 'reason'];

export type PeriodFormState =
  { mode: 'create'; suggested: string } | { mode: 'deadline'; period: Period } | null;

export function PeriodFormDialog({ state, onClose }: { state: PeriodFormState; onClose: () => void }) {
  return (
    <Dialog
      open={state !== null}
      onClose={onClose}
      title={
        state?.mode === 'deadline' ? `Deadline of ${formatPeriod(state.period.period)}` : 'Create a period'
      }
      description={
        state?.mode === 'deadline'
          ? 'Data that arrives after the period is closed is marked late.'
          : 'Labs can submit data for an open period; the deadline must fall after the month has ended.'
      }
      size="sm"
    >
      {state?.mode === 'deadline' ? (
        <DeadlineForm period={state.period} onDone={onClose} />
      ) : state ? (
        <CreateForm suggested={state.suggested} onDone={onClose} />
      ) : null}
    </Dialog>
  );
}

function CreateForm({ suggested, onDone }: { suggested: string; onDone: () => void }) {
  const create = useCreatePeriod();
  const form = useForm<FormValues, unknown, z.output<typeof periodCreateFormSchema>>({
    resolver: zodResolver(
      periodCreateFormSchema as unknown as z.ZodType<z.output<typeof periodCreateFormSchema>, FormValues>,
    ),
    defaultValues: { period: suggested, deadline: usualDeadline(suggested), reason: '' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((body) =>
    create.mutate(body, {
      onSuccess: (created) => {
        showToast(`${formatPeriod(created.period)} is open for submissions.`);
        onDone();
      },
      onError: (error) => applyServerFieldErrors(error, form.setError, fieldNames),
    }),
  );
  return (
    <form noValidate onSubmit={onSubmit}>
      {create.error ? (
        <div className="mb-5">
          <Alert tone="error" title="The period was not created">
            {formAlertMessage(create.error, fieldNames)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4">
        <TextField
          label="Month"
          type="month"
          hint="As YYYY-MM where the browser has no month picker."
          error={errors.period?.message}
          {...form.register('period', {
            // Moving the month moves the suggested deadline with it, unless it was changed by hand.
            onChange: (event: { target: { value: string } }) => {
              const month = event.target.value;
              if (/^\d{4}-\d{2}$/.test(month) && !form.getFieldState('deadline').isDirty) {
                form.setValue('deadline', usualDeadline(month));
              }
            },
          })}
        />
        <TextField
          label="Submission deadline (your local time)"
          type="datetime-local"
          error={errors.deadline?.message}
          {...form.register('deadline')}
        />
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
        <Button type="submit" isLoading={create.isPending}>
          Create period
        </Button>
      </DialogActions>
    </form>
  );
}

function DeadlineForm({ period, onDone }: { period: Period; onDone: () => void }) {
  const change = useChangeDeadline();
  const form = useForm<FormValues, unknown, z.output<typeof periodUpdateFormSchema>>({
    resolver: zodResolver(
      periodUpdateFormSchema as unknown as z.ZodType<z.output<typeof periodUpdateFormSchema>, FormValues>,
    ),
    defaultValues: { period: period.period, deadline: isoToLocalDateTime(period.deadline), reason: '' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((body) =>
    change.mutate(
      { period: period.period, body },
      {
        onSuccess: (updated) => {
          showToast(`The deadline of ${formatPeriod(updated.period)} was moved.`);
          onDone();
        },
        onError: (error) => applyServerFieldErrors(error, form.setError, fieldNames),
      },
    ),
  );
  return (
    <form noValidate onSubmit={onSubmit}>
      {change.error ? (
        <div className="mb-5">
          <Alert tone="error" title="The deadline was not changed">
            {formAlertMessage(change.error, fieldNames)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4">
        <TextField
          label="Submission deadline (your local time)"
          type="datetime-local"
          error={errors.deadline?.message}
          {...form.register('deadline')}
        />
        <TextareaField
          label="Reason for the change, optional"
          hint="Kept in the audit log with the change."
          error={errors.reason?.message}
          {...form.register('reason')}
        />
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onDone}>
          Cancel
        </Button>
        <Button type="submit" isLoading={change.isPending}>
          Save deadline
        </Button>
      </DialogActions>
    </form>
  );
}
