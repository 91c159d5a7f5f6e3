// Create or edit a control lot: its material, lot number, expiry and levels (each with an optional
// description). Validated with the contract's controlLotCreateSchema (levels 1–9, none twice).
import { useFieldArray, useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useQuery } from '@tanstack/react-query';
import { z } from 'zod';
import { controlLotCreateSchema, type ControlLotItem, type ControlMaterialItem } from '@plumbline/contracts';
import { Button } from '../../../components/ui/button.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { catalogueKeys } from '../api/catalogue-keys.ts';
import { textToNumberOrNull } from '../utils/form-values.ts';
import { EntryFormActions, FormError, useEntrySubmit } from './entry-form-parts.tsx';

/** The contract schema, reading each level number from the text of its input. */
export const controlLotFormSchema = controlLotCreateSchema.extend({
  levels: z.preprocess(
    (levels) =>
      Array.isArray(levels)
        ? levels.map((level: { level?: unknown }) => ({ ...level, level: textToNumberOrNull(level.level) }))
        : levels,
    controlLotCreateSchema.shape.levels,
  ),
});

type FormValues = {
  materialId: string;
  lotNumber: string;
  expiresOn: string;
  levels: { level: string; description: string }[];
  reason: string;
};

const fieldNames = ['materialId', 'lotNumber', 'expiresOn', 'levels', 'reason'];

/** The form needs the materials before it renders: a <select> only shows its value once the option exists. */
export function ControlLotForm({ entry, onDone }: { entry: ControlLotItem | null; onDone: () => void }) {
  const materials = useQuery(
    catalogueKeys.list('control-materials', { state: 'active', sort: 'code', limit: 500 }),
  );
  if (materials.isPending) return <PageLoading />;
  return (
    <LotForm
      entry={entry}
      onDone={onDone}
      materials={materials.data?.items ?? []}
      materialsError={materials.isError ? errorMessage(materials.error) : null}
    />
  );
}

function LotForm({
  entry,
  onDone,
  materials,
  materialsError,
}: {
  entry: ControlLotItem | null;
  onDone: () => void;
  materials: ControlMaterialItem[];
  materialsError: string | null;
}) {
  const form = useForm<FormValues, unknown, z.output<typeof controlLotFormSchema>>({
    resolver: zodResolver(
      controlLotFormSchema as unknown as z.ZodType<z.output<typeof controlLotFormSchema>, FormValues>,
    ),
    defaultValues: {
      materialId: entry?.material.id ?? '',
      lotNumber: entry?.lotNumber ?? '',
      expiresOn: entry?.expiresOn ?? '',
      levels: entry
        ? entry.levels.map((l) => ({ level: String(l.level), description: l.description ?? '' }))
        : [
            { level: '1', description: '' },
            { level: '2', description: '' },
          ],
      reason: '',
    },
  });
  const levels = useFieldArray({ control: form.control, name: 'levels' });
  const { errors } = form.formState;
  const { submit, isPending, message } = useEntrySubmit('control-lots', {
    id: entry?.id,
    fieldNames,
    setError: form.setError,
    onSaved: onDone,
  });

  // A lot of a retired material still shows its material, though no new lot may use it.
  const options = materials;
  const showCurrent = entry && !options.some((m) => m.id === entry.material.id);
  const levelsError = errors.levels?.message ?? errors.levels?.root?.message;
  const nextLevel = () => {
    const used = new Set(form.getValues('levels').map((l) => Number(l.level)));
    for (let n = 1; n <= 9; n++) if (!used.has(n)) return String(n);
    return '';
  };

  return (
    <form noValidate onSubmit={form.handleSubmit((values) => submit(values, values.lotNumber))}>
      <FormError message={message} />
      <div className="grid gap-4 sm:grid-cols-2">
        <SelectField
          label="Control material"
          className="sm:col-span-2"
          error={errors.materialId?.message}
          hint={materialsError ? `The control materials could not be loaded: ${materialsError}` : undefined}
          {...form.register('materialId')}
        >
          <option value="">Choose a material…</option>
          {showCurrent ? (
            <option value={entry.material.id}>
              {entry.material.code} · {entry.material.name} (retired)
            </option>
          ) : null}
          {options.map((m) => (
            <option key={m.id} value={m.id}>
              {m.code} · {m.name}
            </option>
          ))}
        </SelectField>
        <TextField
          label="Lot number"
          spellCheck={false}
          error={errors.lotNumber?.message}
          {...form.register('lotNumber')}
        />
        <TextField
          label="Expires on"
          type="date"
          error={errors.expiresOn?.message}
          {...form.register('expiresOn')}
        />
      </div>

      <fieldset
        className="mt-5 rounded-lg border border-slate-200 px-4 pt-2 pb-4"
        aria-describedby={levelsError ? 'lot-levels-error' : undefined}
      >
        <legend className="px-1 text-sm font-semibold text-slate-800">Levels</legend>
        <p className="mb-3 text-xs text-slate-600">
          Level numbers 1 to 9. A level that QC data already uses cannot be removed.
        </p>
        <div
          aria-hidden="true"
          className="grid grid-cols-[5rem_1fr_5.5rem] gap-3 pb-1 text-xs font-medium text-slate-700"
        >
          <span>Level</span>
          <span>Description, optional</span>
        </div>
        <ul className="space-y-2">
          {levels.fields.map((level, index) => {
            const levelError = errors.levels?.[index]?.level?.message;
            const descriptionError = errors.levels?.[index]?.description?.message;
            return (
              <li key={level.id}>
                <div className="grid grid-cols-[5rem_1fr_5.5rem] items-center gap-3">
                  <input
                    aria-label={`Level ${index + 1}: number`}
                    inputMode="numeric"
                    aria-invalid={levelError ? true : undefined}
                    className={`h-9 rounded-md border bg-white px-3 text-right text-[0.95rem] shadow-xs ${levelError ? 'border-alarm-700' : 'border-slate-300'}`}
                    {...form.register(`levels.${index}.level`)}
                  />
                  <input
                    aria-label={`Level ${index + 1}: description`}
                    placeholder="e.g. normal, pathological"
                    aria-invalid={descriptionError ? true : undefined}
                    className={`h-9 rounded-md border bg-white px-3 text-[0.95rem] shadow-xs placeholder:text-slate-400 ${descriptionError ? 'border-alarm-700' : 'border-slate-300'}`}
                    {...form.register(`levels.${index}.description`)}
                  />
                  <Button
                    variant="ghost"
                    size="sm"
                    onClick={() => levels.remove(index)}
                    aria-label={`Remove level ${index + 1}`}
                  >
                    Remove
                  </Button>
                </div>
                {levelError || descriptionError ? (
                  <p className="mt-1 text-sm font-medium text-alarm-700">
                    Level {index + 1}: {levelError ?? descriptionError}
                  </p>
                ) : null}
              </li>
            );
          })}
        </ul>
        {levelsError ? (
          <p id="lot-levels-error" className="mt-2 text-sm font-medium text-alarm-700">
            {levelsError.charAt(0).toUpperCase() + levelsError.slice(1)}
          </p>
        ) : null}
        <Button
          variant="secondary"
          size="sm"
          className="mt-3"
          disabled={levels.fields.length >= 9}
          onClick={() => levels.append({ level: nextLevel(), description: '' })}
        >
          Add a level
        </Button>
      </fieldset>

      {entry ? (
        <TextareaField
          className="mt-5"
          label="Reason for the change, optional"
          hint="Kept in the audit log with the change."
          error={errors.reason?.message}
          {...form.register('reason')}
        />
      ) : null}
      <EntryFormActions onCancel={onDone} isPending={isPending} isEdit={entry !== null} />
    </form>
  );
}
