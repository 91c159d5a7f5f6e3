// Register a measurement procedure (analyte + instrument model + method + reagent + unit + the lab's
// short code) or edit an existing one's code and unit. The catalogue entries come from the network's
// catalogue; the API checks that the unit converts to the analyte's.
import { useEffect } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { procedureCodeSchema, procedureCreateSchema, type TestMenuItem } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { Dialog, DialogActions } from '../../../components/ui/dialog.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { applyServerFieldErrors, errorMessage, formAlertMessage } from '../../../lib/form-errors.ts';
import { useEditProcedure, useRegisterProcedure } from '../api/save-procedure.ts';
import { testMenuKeys, type ProcedureCatalogueList } from '../api/test-menu-keys.ts';

export type ProcedureDialogRequest = { mode: 'register' } | { mode: 'edit'; procedure: TestMenuItem } | null;

export function ProcedureFormDialog({
  labId,
  request,
  onClose,
}: {
  labId: string;
  request: ProcedureDialogRequest;
  onClose: () => void;
}) {
  const title =
    request?.mode === 'edit'
      ? `Edit procedure ${request.procedure.code}`
      : 'Register a measurement procedure';
  return (
    <Dialog open={request !== null} onClose={onClose} title={title} size="lg">
      {request?.mode === 'edit' ? (
        <EditForm key={request.procedure.id} labId={labId} procedure={request.procedure} onClose={onClose} />
      ) : request?.mode === 'register' ? (
        <RegisterForm labId={labId} onClose={onClose} />
      ) : null}
    </Dialog>
  );
}

type RegisterValues = z.input<typeof procedureCreateSchema>;
const registerFields = ['code', 'analyteId', 'instrumentModelId', 'methodId', 'reagentId', 'unit'];

/** A missing choice reads "choose the …"; the API's own message (e.g. a retired entry) is shown as it is. */
function choiceError(
  error: { type?: string; message?: string } | undefined,
  missing: string,
): string | undefined {
  if (!error) return undefined;
  return error.type === 'server' && error.message ? error.message : missing;
}

function useCatalogue(list: ProcedureCatalogueList) {
  return useQuery(testMenuKeys.catalogue(list));
}

function RegisterForm({ labId, onClose }: { labId: string; onClose: () => void }) {
  const analytes = useQuery(testMenuKeys.catalogue('analytes'));
  const instruments = useCatalogue('instrument-models');
  const methods = useCatalogue('methods');
  const reagents = useCatalogue('reagents');
  const register = useRegisterProcedure();
  const form = useForm<RegisterValues, unknown, z.output<typeof procedureCreateSchema>>({
    resolver: zodResolver(procedureCreateSchema),
    defaultValues: { code: '', analyteId: '', instrumentModelId: '', methodId: '', reagentId: '', unit: '' },
  });
  const { errors } = form.formState;
  const analyteId = form.watch('analyteId');
  const analyte = analytes.data?.items.find((a) => a.id === analyteId);

  // Choosing an analyte proposes its unit; the lab may report in another convertible unit.
  useEffect(() => {
    if (analyte && !form.getValues('unit')) form.setValue('unit', analyte.unit);
  }, [analyte, form]);

  const failed = [analytes, instruments, methods, reagents].find((q) => q.isError);
  if (failed) {
    return (
      <Alert tone="error" title="The catalogue could not be read">
        {errorMessage(failed.error)} The analytes, instrument models, methods and reagents come from the
        network’s catalogue; ask your network coordinator if it stays unavailable.
      </Alert>
    );
  }

  const onSubmit = form.handleSubmit((body) =>
    register.mutate(
      { labId, body },
      {
        onSuccess: (procedure) => {
          showToast(`Procedure ${procedure.code} registered.`);
          onClose();
        },
        onError: (error) => applyServerFieldErrors(error, form.setError, registerFields),
      },
    ),
  );

  const pick = (label: string) => `Select the ${label}…`;
  return (
    <form noValidate onSubmit={onSubmit}>
      {register.error ? (
        <div className="mb-5">
          <Alert tone="error" title="The procedure was not registered">
            {formAlertMessage(register.error, registerFields)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Analyte"
          error={choiceError(errors.analyteId, 'choose the analyte')}
          {...form.register('analyteId')}
        >
          <option value="">{analytes.isPending ? 'Loading…' : pick('analyte')}</option>
          {analytes.data?.items.map((item) => (
            <option key={item.id} value={item.id}>
              {item.name} ({item.code}
              {item.loinc ? `, LOINC ${item.loinc}` : ''})
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Instrument model"
          error={choiceError(errors.instrumentModelId, 'choose the instrument model')}
          {...form.register('instrumentModelId')}
        >
          <option value="">{instruments.isPending ? 'Loading…' : pick('instrument model')}</option>
          {instruments.data?.items.map((item) => (
            <option key={item.id} value={item.id}>
              {item.name} ({item.code})
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Method"
          error={choiceError(errors.methodId, 'choose the method')}
          {...form.register('methodId')}
        >
          <option value="">{methods.isPending ? 'Loading…' : pick('method')}</option>
          {methods.data?.items.map((item) => (
            <option key={item.id} value={item.id}>
              {item.name} ({item.code})
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Reagent"
          error={choiceError(errors.reagentId, 'choose the reagent')}
          {...form.register('reagentId')}
        >
          <option value="">{reagents.isPending ? 'Loading…' : pick('reagent')}</option>
          {reagents.data?.items.map((item) => (
            <option key={item.id} value={item.id}>
              {item.name} ({item.code})
            </option>
          ))}
        </SelectField>
        <TextField
          label="Unit the lab reports in"
          hint={
            analyte
              ? `UCUM; must convert to ${analyte.unit}${analyte.conventionalUnit ? ` (conventional ${analyte.conventionalUnit})` : ''}.`
              : 'UCUM, e.g. mmol/L.'
          }
          autoComplete="off"
          spellCheck={false}
          error={
            errors.unit
              ? errors.unit.type === 'too_small'
                ? 'enter the unit, e.g. mmol/L'
                : errors.unit.message
              : undefined
          }
          {...form.register('unit')}
        />
        <TextField
          label="Short code"
          hint="The code your QC files use for this procedure, e.g. K-CHEM2."
          autoComplete="off"
          spellCheck={false}
          error={errors.code?.message}
          {...form.register('code')}
        />
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onClose}>
          Cancel
        </Button>
        <Button type="submit" isLoading={register.isPending}>
          Register procedure
        </Button>
      </DialogActions>
    </form>
  );
}

const editSchema = z.object({
  code: procedureCodeSchema,
  unit: z.string().trim().min(1, 'enter a UCUM unit').max(40),
  reason: z.string().trim().max(500).optional(),
});
type EditValues = z.input<typeof editSchema>;
const editFields = ['code', 'unit', 'reason'];

function EditForm({
  labId,
  procedure,
  onClose,
}: {
  labId: string;
  procedure: TestMenuItem;
  onClose: () => void;
}) {
  const edit = useEditProcedure();
  const form = useForm<EditValues, unknown, z.output<typeof editSchema>>({
    resolver: zodResolver(editSchema),
    defaultValues: { code: procedure.code, unit: procedure.unit, reason: '' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit((values) => {
    const body = {
      code: values.code !== procedure.code ? values.code : undefined,
      unit: values.unit !== procedure.unit ? values.unit : undefined,
      reason: values.reason || undefined,
    };
    if (body.code === undefined && body.unit === undefined) {
      onClose();
      return;
    }
    edit.mutate(
      { labId, procedureId: procedure.id, body },
      {
        onSuccess: (saved) => {
          showToast(`Procedure ${saved.code} saved.`);
          onClose();
        },
        onError: (error) => applyServerFieldErrors(error, form.setError, editFields),
      },
    );
  });
  return (
    <form noValidate onSubmit={onSubmit}>
      <p className="mb-4 text-sm text-slate-700">
        {procedure.analyte.name} on {procedure.instrumentModel.name}, {procedure.method.name},{' '}
        {procedure.reagent.name}. To change the analyte, instrument model, method or reagent, retire this
        procedure and register a new one.
      </p>
      {edit.error ? (
        <div className="mb-5">
          <Alert tone="error" title="The procedure was not saved">
            {formAlertMessage(edit.error, editFields)}
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField
          label="Short code"
          autoComplete="off"
          spellCheck={false}
          error={errors.code?.message}
          {...form.register('code')}
        />
        <TextField
          label="Unit the lab reports in"
          hint={`UCUM; must convert to ${procedure.analyte.unit}.`}
          autoComplete="off"
          spellCheck={false}
          error={errors.unit?.message}
          {...form.register('unit')}
        />
        <TextField
          className="sm:col-span-2"
          label="Reason, optional (kept in the audit log)"
          error={errors.reason?.message}
          {...form.register('reason')}
        />
      </div>
      <DialogActions>
        <Button variant="secondary" onClick={onClose}>
          Cancel
        </Button>
        <Button type="submit" isLoading={edit.isPending}>
          Save
        </Button>
      </DialogActions>
    </form>
  );
}
