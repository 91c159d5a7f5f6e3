import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { paths } from '../../../config/paths.ts';
import { riKeys } from '../api/ri-keys.ts';
import { useSaveCurrentInterval } from '../api/ri-actions.ts';
import { IntervalCaution } from './interval-caution.tsx';

const sexText = { all: 'Women and men', female: 'Women', male: 'Men' };

/** The intervals the lab prints on its reports today, per analyte and partition, with their source. */
export function CurrentIntervals({ canManage }: { canManage: boolean }) {
  const current = useQuery(riKeys.current());
  if (current.isPending) return <PageLoading />;
  if (current.isError) return <Alert tone="error">{current.error.message}</Alert>;
  return (
    <div className="grid gap-6">
      <IntervalCaution />
      <table className="w-full text-left text-sm">
        <thead className="border-b border-slate-200 text-slate-600">
          <tr>
            <th className="py-2 pr-4 font-medium">Analyte</th>
            <th className="py-2 pr-4 font-medium">Partition</th>
            <th className="py-2 pr-4 font-medium">Interval</th>
            <th className="py-2 pr-4 font-medium">Source</th>
          </tr>
        </thead>
        <tbody>
          {current.data.map((c) => (
            <tr key={c.id} className="border-b border-slate-100">
              <td className="py-2 pr-4">{c.analyte.name}</td>
              <td className="py-2 pr-4">
                {sexText[c.sex]}, {c.ageLow}–{c.ageHigh} years
              </td>
              <td className="py-2 pr-4">
                {c.lower}–{c.upper} {c.analyte.unit}
              </td>
              <td className="py-2 pr-4">
                {c.adoptedFrom ? (
                  <Link className="underline" to={paths.lab.riStudy.getHref(c.adoptedFrom.studyId)}>
                    {c.source}
                  </Link>
                ) : (
                  c.source
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      {canManage ? <CurrentIntervalForm /> : null}
    </div>
  );
}

function CurrentIntervalForm() {
  const analytes = useQuery(riKeys.analytes());
  const save = useSaveCurrentInterval();
  const [f, setF] = useState({
    analyteId: '',
    sex: 'all',
    ageLow: '18',
    ageHigh: '120',
    lower: '',
    upper: '',
    source: '',
  });
  const set = (k: keyof typeof f) => (e: { target: { value: string } }) =>
    setF({ ...f, [k]: e.target.value });
  return (
    <form
      className="grid max-w-3xl gap-3 md:grid-cols-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate({
          analyteId: f.analyteId,
          sex: f.sex as 'all' | 'female' | 'male',
          ageLow: Number(f.ageLow),
          ageHigh: Number(f.ageHigh),
          lower: Number(f.lower),
          upper: Number(f.upper),
          source: f.source,
        });
      }}
    >
      <h2 className="text-lg font-semibold md:col-span-2">Enter or change an interval</h2>
      <SelectField label="Analyte" value={f.analyteId} onChange={set('analyteId')} required>
        <option value="">Choose…</option>
        {analytes.data?.items.map((a) => (
          <option key={a.id} value={a.id}>
            {a.name} ({a.unit})
          </option>
        ))}
      </SelectField>
      <SelectField label="Sex" value={f.sex} onChange={set('sex')}>
        <option value="all">Women and men</option>
        <option value="female">Women</option>
        <option value="male">Men</option>
      </SelectField>
      <TextField label="From age" value={f.ageLow} onChange={set('ageLow')} />
      <TextField label="To age" value={f.ageHigh} onChange={set('ageHigh')} />
      <TextField label="Lower limit" value={f.lower} onChange={set('lower')} required />
      <TextField label="Upper limit" value={f.upper} onChange={set('upper')} required />
      <TextField
        className="md:col-span-2"
        label="Source"
        value={f.source}
        onChange={set('source')}
        required
      />
      {save.isError ? <Alert tone="error">{save.error.message}</Alert> : null}
      <div>
        <Button type="submit" isLoading={save.isPending}>
          Save interval
        </Button>
      </div>
    </form>
  );
}
