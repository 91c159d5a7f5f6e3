import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { useNavigate } from 'react-router-dom';
import {
  outlierScreenings,
  patientSettings,
  studyMethods,
  type OutlierScreening,
  type PatientSetting,
  type StudyInput,
  type StudyMethod,
} from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { paths } from '../../../config/paths.ts';
import { useDebouncedValue } from '../../../hooks/use-debounced-value.ts';
import { riKeys } from '../api/ri-keys.ts';
import { useCreateStudy } from '../api/ri-actions.ts';

const methodText: Record<StudyMethod, string> = {
  nonparametric: 'Direct nonparametric (at least 120 per partition)',
  robust: 'Robust, Horn & Pesce (20 to 119 per partition)',
  indirect: 'Indirect, from routine results (at least 1000)',
};
const screeningText: Record<OutlierScreening, string> = {
  tukey: 'Tukey fences after Box-Cox',
  dixon: 'Dixon (D/R ≥ 1/3)',
  none: 'No screening',
};

/** Parses "18-44, 45-64, 65-120" into age bands; null when a band is not "low-high". */
function parseBands(text: string): { low: number; high: number }[] | null {
  if (text.trim() === '') return [];
  const bands = text.split(',').map((part) => /^\s*(\d+)\s*[-–]\s*(\d+)\s*$/.exec(part));
  if (bands.some((b) => !b)) return null;
  return bands.map((b) => ({ low: Number(b![1]), high: Number(b![2]) }));
}

export function NewStudyForm() {
  const navigate = useNavigate();
  const analytes = useQuery(riKeys.analytes());
  const create = useCreateStudy();
  const [name, setName] = useState('');
  const [analyteId, setAnalyteId] = useState('');
  const [fromMonth, setFromMonth] = useState('');
  const [toMonth, setToMonth] = useState('');
  const [settings, setSettings] = useState<PatientSetting[]>([]);
  const [ageLow, setAgeLow] = useState('18');
  const [ageHigh, setAgeHigh] = useState('120');
  const [sex, setSex] = useState<'all' | 'female' | 'male'>('all');
  const [bySex, setBySex] = useState(true);
  const [bands, setBands] = useState('');
  const [method, setMethod] = useState<StudyMethod>('nonparametric');
  const [screening, setScreening] = useState<OutlierScreening>('tukey');

  const selection = {
    fromMonth: fromMonth || undefined,
    toMonth: toMonth || undefined,
    settings: settings.length ? settings : undefined,
    ageLow: Number(ageLow) || 0,
    ageHigh: Number(ageHigh) || 120,
    sex,
  };
  const debounced = useDebouncedValue(JSON.stringify(selection), 300);
  const count = useQuery({
    ...riKeys.count(analyteId, JSON.parse(debounced)),
    enabled: analyteId !== '',
  });
  const ageBands = parseBands(bands);

  const submit = (event: React.FormEvent) => {
    event.preventDefault();
    if (!ageBands) return;
    const input: StudyInput = {
      name,
      analyteId,
      selection,
      partitioning: { bySex: sex === 'all' && bySex, ageBands },
      method,
      screening,
    };
    create.mutate(input, { onSuccess: (study) => navigate(paths.lab.riStudy.getHref(study.id)) });
  };

  return (
    <form onSubmit={submit} className="grid max-w-3xl gap-5">
      <TextField label="Name of the study" value={name} onChange={(e) => setName(e.target.value)} required />
      <SelectField label="Analyte" value={analyteId} onChange={(e) => setAnalyteId(e.target.value)} required>
        <option value="">Choose an analyte…</option>
        {analytes.data?.items.map((a) => (
          <option key={a.id} value={a.id}>
            {a.name} ({a.unit})
          </option>
        ))}
      </SelectField>
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-slate-900">Which results</legend>
        <TextField
          label="From month (YYYY-MM)"
          value={fromMonth}
          onChange={(e) => setFromMonth(e.target.value)}
        />
        <TextField label="To month (YYYY-MM)" value={toMonth} onChange={(e) => setToMonth(e.target.value)} />
        <TextField
          label="Youngest age (years)"
          inputMode="numeric"
          value={ageLow}
          onChange={(e) => setAgeLow(e.target.value)}
        />
        <TextField
          label="Oldest age (years)"
          inputMode="numeric"
          value={ageHigh}
          onChange={(e) => setAgeHigh(e.target.value)}
        />
        <SelectField label="Sex" value={sex} onChange={(e) => setSex(e.target.value as typeof sex)}>
          <option value="all">Women and men</option>
          <option value="female">Women only</option>
          <option value="male">Men only</option>
        </SelectField>
        <div className="flex flex-col gap-1.5">
          <span className="text-sm font-medium text-slate-800">Settings (none ticked: all)</span>
          <div className="flex flex-wrap gap-3">
            {patientSettings.map((s) => (
              <label key={s} className="flex items-center gap-1.5 text-sm">
                <input
                  type="checkbox"
                  checked={settings.includes(s)}
                  onChange={(e) =>
                    setSettings(e.target.checked ? [...settings, s] : settings.filter((x) => x !== s))
                  }
                />
                {s}
              </label>
            ))}
          </div>
        </div>
      </fieldset>
      <p className="text-sm text-slate-800" aria-live="polite" data-testid="matching-count">
        {analyteId === ''
          ? 'Choose an analyte to see how many results match.'
          : count.data
            ? `${count.data.count.toLocaleString('en')} results match (repeats of a sample key counted once).`
            : 'Counting matching results…'}
      </p>
      <fieldset className="grid gap-4 md:grid-cols-2">
        <legend className="mb-2 text-sm font-semibold text-slate-900">Partitions</legend>
        <label className="flex items-center gap-2 text-sm">
          <input
            type="checkbox"
            checked={bySex}
            disabled={sex !== 'all'}
            onChange={(e) => setBySex(e.target.checked)}
          />
          Separate women and men
        </label>
        <TextField
          label="Age bands (e.g. 18-44, 45-64, 65-120)"
          value={bands}
          onChange={(e) => setBands(e.target.value)}
          error={ageBands ? undefined : 'Write each band as low-high, separated by commas.'}
        />
      </fieldset>
      <div className="grid gap-4 md:grid-cols-2">
        <SelectField label="Method" value={method} onChange={(e) => setMethod(e.target.value as StudyMethod)}>
          {studyMethods.map((m) => (
            <option key={m} value={m}>
              {methodText[m]}
            </option>
          ))}
        </SelectField>
        <SelectField
          label="Outlier screening"
          value={screening}
          onChange={(e) => setScreening(e.target.value as OutlierScreening)}
        >
          {outlierScreenings.map((s) => (
            <option key={s} value={s}>
              {screeningText[s]}
            </option>
          ))}
        </SelectField>
      </div>
      {create.isError ? <Alert tone="error">{create.error.message}</Alert> : null}
      <div>
        <Button type="submit" isLoading={create.isPending}>
          Create and run the study
        </Button>
      </div>
    </form>
  );
}
