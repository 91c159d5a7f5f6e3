// Create or edit an analyte. The contract's analyteCreateSchema validates the form (LOINC check digit,
// ranges); the API adds what only it can check (UCUM units, TEa source and date, the plausibility
// limits' source and order, a unit in use), and those answers appear beside their fields.
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { analyteCreateSchema, type AnalyteItem } from '@plumbline/contracts';
import { TextField } from '../../../components/ui/text-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { asInputText, numberInput } from '../utils/form-values.ts';
import { EntryFormActions, FormError, useEntrySubmit } from './entry-form-parts.tsx';

const { molarMass, decimals, teaPct, teaAbsolute, plausibleLow, plausibleHigh } = analyteCreateSchema.shape;
/** The contract schema, reading its numbers from the text of their inputs. */
export const analyteFormSchema = analyteCreateSchema.extend({
  molarMass: numberInput(molarMass),
  decimals: numberInput(decimals, 'undefined'),
  teaPct: numberInput(teaPct),
  teaAbsolute: numberInput(teaAbsolute),
  plausibleLow: numberInput(plausibleLow),
  plausibleHigh: numberInput(plausibleHigh),
});

const fieldNames = [
  'code',
  'name',
  'loinc',
  'unit',
  'conventionalUnit',
  'molarMass',
  'decimals',
  'teaPct',
  'teaAbsolute',
  'teaSource',
  'teaDate',
  'plausibleLow',
  'plausibleHigh',
  'plausibilitySource',
  'allowsNegative',
  'reason',
] as const;
type FieldName = (typeof fieldNames)[number];
type FormValues = Record<FieldName, string>;

function defaultsOf(entry: AnalyteItem | null): FormValues {
  return {
    code: asInputText(entry?.code),
    name: asInputText(entry?.name),
    loinc: asInputText(entry?.loinc),
    unit: asInputText(entry?.unit),
    conventionalUnit: asInputText(entry?.conventionalUnit),
    molarMass: asInputText(entry?.molarMass),
    decimals: asInputText(entry?.decimals ?? 2),
    teaPct: asInputText(entry?.teaPct),
    teaAbsolute: asInputText(entry?.teaAbsolute),
    teaSource: asInputText(entry?.teaSource),
    teaDate: asInputText(entry?.teaDate),
    plausibleLow: asInputText(entry?.plausibleLow),
    plausibleHigh: asInputText(entry?.plausibleHigh),
    plausibilitySource: asInputText(entry?.plausibilitySource),
    allowsNegative: entry?.allowsNegative ? 'true' : 'false',
    reason: '',
  };
}

export function AnalyteForm({ entry, onDone }: { entry: AnalyteItem | null; onDone: () => void }) {
  const form = useForm<FormValues, unknown, z.output<typeof analyteFormSchema>>({
    resolver: zodResolver(
      analyteFormSchema as unknown as z.ZodType<z.output<typeof analyteFormSchema>, FormValues>,
    ),
    defaultValues: defaultsOf(entry),
  });
  const { errors } = form.formState;
  const { submit, isPending, message } = useEntrySubmit('analytes', {
    id: entry?.id,
    fieldNames,
    setError: form.setError,
    onSaved: onDone,
  });
  const field = (name: FieldName) => ({ error: errors[name]?.message, ...form.register(name) });

  return (
    <form noValidate onSubmit={form.handleSubmit((values) => submit(values, values.code))}>
      <FormError message={message} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label="Code" spellCheck={false} {...field('code')} />
        <TextField label="Name" {...field('name')} />
        <TextField
          label="LOINC code, optional"
          hint="Digits, a hyphen and the check digit, e.g. 2345-7."
          spellCheck={false}
          {...field('loinc')}
        />
        <TextField
          label="Display decimals"
          inputMode="numeric"
          hint="0 to 6; 2 when left empty."
          {...field('decimals')}
        />
        <TextField
          label="Unit (UCUM)"
          hint="Values are stored in this unit; it cannot change once procedures use the analyte."
          spellCheck={false}
          {...field('unit')}
        />
        <TextField
          label="Conventional unit (UCUM), optional"
          hint="Must convert to the unit; mass ↔ substance needs the molar mass."
          spellCheck={false}
          {...field('conventionalUnit')}
        />
        <TextField label="Molar mass (g/mol), optional" inputMode="decimal" {...field('molarMass')} />
      </div>
      <fieldset className="mt-5 rounded-lg border border-slate-200 px-4 pt-2 pb-4">
        <legend className="px-1 text-sm font-semibold text-slate-800">Total allowable error, optional</legend>
        <p className="mb-3 text-xs text-slate-600">
          As published rules state it: ± the absolute part or ± the percentage, whichever is greater at the
          control&apos;s concentration. Either part may be left empty. A TEa needs its source and the date of
          that source.
        </p>
        <div className="grid gap-4 sm:grid-cols-[8rem_8rem_1fr_10rem]">
          <TextField label="TEa (%)" inputMode="decimal" {...field('teaPct')} />
          <TextField label="TEa (± in the unit)" inputMode="decimal" {...field('teaAbsolute')} />
          <TextField label="Source" {...field('teaSource')} />
          <TextField label="Date of source" type="date" {...field('teaDate')} />
        </div>
      </fieldset>
      <fieldset className="mt-5 rounded-lg border border-slate-200 px-4 pt-2 pb-4">
        <legend className="px-1 text-sm font-semibold text-slate-800">Plausibility limits, optional</legend>
        <p className="mb-3 text-xs text-slate-600">
          In the unit above. A QC mean or value outside them is refused at upload. Name the source, or write
          &quot;common practice&quot;.
        </p>
        <div className="grid gap-4 sm:grid-cols-[8rem_8rem_1fr_10rem]">
          <TextField label="Low limit" inputMode="decimal" {...field('plausibleLow')} />
          <TextField label="High limit" inputMode="decimal" {...field('plausibleHigh')} />
          <TextField label="Source of the limits" {...field('plausibilitySource')} />
          <SelectField label="Results below zero" {...field('allowsNegative')}>
            <option value="false">Not possible</option>
            <option value="true">Possible</option>
          </SelectField>
        </div>
      </fieldset>
      {entry ? (
        <TextareaField
          className="mt-5"
          label="Reason for the change, optional"
          hint="Kept in the audit log with the change."
          {...field('reason')}
        />
      ) : null}
      <EntryFormActions onCancel={onDone} isPending={isPending} isEdit={entry !== null} />
    </form>
  );
}
