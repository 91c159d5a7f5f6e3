// Create or edit a method, instrument model, reagent or control material: code, name and one or two
// descriptive fields, validated with the list's contract schema.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import type { z } from 'zod';
import {
  controlMaterialCreateSchema,
  instrumentModelCreateSchema,
  methodCreateSchema,
  reagentCreateSchema,
  type CatalogueList,
} from '@plumbline/contracts';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import type { CatalogueItemOf } from '../api/catalogue-keys.ts';
import { asInputText } from '../utils/form-values.ts';
import { EntryFormActions, FormError, useEntrySubmit } from './entry-form-parts.tsx';

export type SimpleList = Exclude<CatalogueList, 'analytes' | 'control-lots'>;
type SimpleItem = CatalogueItemOf<SimpleList>;

const createSchemas = {
  methods: methodCreateSchema,
  'instrument-models': instrumentModelCreateSchema,
  reagents: reagentCreateSchema,
  'control-materials': controlMaterialCreateSchema,
} satisfies Record<SimpleList, z.ZodType>;

const extraFields: Record<SimpleList, { name: string; label: string; hint?: string }[]> = {
  methods: [
    { name: 'principle', label: 'Principle', hint: 'e.g. enzymatic colorimetric, ion-selective electrode' },
  ],
  'instrument-models': [{ name: 'manufacturer', label: 'Manufacturer' }],
  reagents: [{ name: 'manufacturer', label: 'Manufacturer' }],
  'control-materials': [
    { name: 'manufacturer', label: 'Manufacturer' },
    { name: 'matrix', label: 'Matrix', hint: 'e.g. human serum, lyophilised' },
  ],
};

type FormValues = Record<string, string>;

export function SimpleEntryForm({
  list,
  entry,
  onDone,
}: {
  list: SimpleList;
  entry: SimpleItem | null;
  onDone: () => void;
}) {
  const extras = extraFields[list];
  const fieldNames = ['code', 'name', ...extras.map((f) => f.name), 'reason'];
  const record = (entry ?? {}) as Record<string, string | null | undefined>;
  const form = useForm<FormValues, unknown, Record<string, unknown>>({
    resolver: zodResolver(createSchemas[list] as unknown as z.ZodType<Record<string, unknown>, FormValues>),
    defaultValues: Object.fromEntries(fieldNames.map((name) => [name, asInputText(record[name])])),
  });
  const { errors } = form.formState;
  const errorOf = (name: string) => errors[name]?.message as string | undefined;
  const { submit, isPending, message } = useEntrySubmit(list, {
    id: entry?.id,
    fieldNames,
    setError: form.setError,
    onSaved: onDone,
  });

  return (
    <form noValidate onSubmit={form.handleSubmit((values) => submit(values, String(values.code)))}>
      <FormError message={message} />
      <div className="grid gap-4 sm:grid-cols-[12rem_1fr]">
        <TextField label="Code" spellCheck={false} error={errorOf('code')} {...form.register('code')} />
        <TextField label="Name" error={errorOf('name')} {...form.register('name')} />
        {extras.map((field) => (
          <TextField
            key={field.name}
            className="sm:col-span-2"
            label={`${field.label}, optional`}
            hint={field.hint}
            error={errorOf(field.name)}
            {...form.register(field.name)}
          />
        ))}
        {entry ? (
          <TextareaField
            className="sm:col-span-2"
            label="Reason for the change, optional"
            hint="Kept in the audit log with the change."
            error={errorOf('reason')}
            {...form.register('reason')}
          />
        ) : null}
      </div>
      <EntryFormActions onCancel={onDone} isPending={isPending} isEdit={entry !== null} />
    </form>
  );
}
