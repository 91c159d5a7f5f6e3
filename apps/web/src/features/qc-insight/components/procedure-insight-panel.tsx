// On a result's drill-down: the shifts detected in the procedure's monthly SDI for this lot and level,
// each with the events recorded before it; the form to record an event; the QC plan recommendation.
import { useState, type FormEvent } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { procedureEventKinds, type ProcedureEventKind } from '@plumbline/contracts';
import { TrendChart } from '../../../components/charts/trend-chart.tsx';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { qcInsightKeys, recordProcedureEvent } from '../api/qc-insight-keys.ts';
import { describePlan } from './plan-text.ts';

export const eventKindLabels: Record<ProcedureEventKind, string> = {
  'reagent-lot': 'Reagent lot change',
  'calibrator-lot': 'Calibrator lot change',
  'control-lot': 'Control lot change',
  maintenance: 'Maintenance',
  recalibration: 'Recalibration',
  'software-update': 'Software update',
  other: 'Other change',
};

export function ProcedureInsightPanel({
  labId,
  procedureId,
  controlLotId,
  level,
  canRecord,
}: {
  labId: string;
  procedureId: string;
  controlLotId: string;
  level: number;
  canRecord: boolean;
}) {
  const queryClient = useQueryClient();
  const shifts = useQuery(qcInsightKeys.shifts(labId, procedureId, controlLotId, level));
  const events = useQuery(qcInsightKeys.events(labId, procedureId));
  // The plan page's figures take longest; asked for once the shifts are in.
  const plan = useQuery({ ...qcInsightKeys.qcPlan(labId), enabled: shifts.data !== undefined });
  const [occurredOn, setOccurredOn] = useState('');
  const [kind, setKind] = useState<ProcedureEventKind>('reagent-lot');
  const [note, setNote] = useState('');
  const record = useMutation({
    mutationFn: () => recordProcedureEvent(labId, procedureId, { occurredOn, kind, note }),
    onSuccess: async () => {
      showToast('Event recorded.');
      setNote('');
      await queryClient.invalidateQueries({ queryKey: qcInsightKeys.all });
    },
  });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    record.mutate();
  };

  const series = shifts.data?.series.find((s) => s.controlLotId === controlLotId && s.level === level);
  const found = (shifts.data?.shifts ?? []).filter(
    (s) => s.controlLotId === controlLotId && s.level === level,
  );
  const firstPeriod = series?.points[0]?.period ?? '';
  const eventMarks = (events.data ?? [])
    .filter((e) => e.occurredOn.slice(0, 7) >= firstPeriod)
    .map((e) => ({
      period: e.occurredOn.slice(0, 7),
      label: `${eventKindLabels[e.kind]} on ${e.occurredOn}`,
      kind: 'event' as const,
    }));
  const row = plan.data?.rows.find((r) => r.procedure.id === procedureId && r.level === level);

  return (
    <section aria-labelledby="insight-heading" className="space-y-6" data-testid="procedure-insight">
      <h2 id="insight-heading" className="text-lg font-semibold text-slate-900">
        Shifts, events and QC plan
      </h2>
      {shifts.isError ? (
        <Alert tone="error" title="Shifts could not be computed">
          {errorMessage(shifts.error)}
        </Alert>
      ) : null}
      {series && series.points.length > 0 ? (
        <TrendChart
          measure="sdi"
          testId="trend-chart-sdi-shifts"
          headingLevel={3}
          title="SDI with detected shifts and recorded events"
          points={series.points.map((p) => ({ period: p.period, value: p.sdi }))}
          marks={[
            ...found.map((s) => ({
              period: s.period,
              label: `Shift from ${s.period}`,
              kind: 'shift' as const,
            })),
            ...eventMarks,
          ]}
        />
      ) : null}
      <div>
        <h3 className="font-medium text-slate-900">Detected shifts</h3>
        {shifts.isPending ? (
          <p className="text-sm text-slate-600">Looking for shifts…</p>
        ) : found.length === 0 ? (
          <p className="text-sm text-slate-600">No shift detected in this lot and level.</p>
        ) : (
          <ul className="mt-2 space-y-2" data-testid="detected-shifts">
            {found.map((s) => (
              <li
                key={`${s.period}-${s.signalPeriod}`}
                className="rounded-md bg-alarm-50 p-3 text-sm text-slate-800"
              >
                SDI shifted {s.direction} by {Math.abs(s.sizeSdi).toFixed(1)} (
                {s.sizePct === null
                  ? 'bias change unknown'
                  : `${s.sizePct > 0 ? '+' : ''}${s.sizePct.toFixed(1)} % bias`}
                ) from {formatPeriod(s.period)}, signalled in {formatPeriod(s.signalPeriod)}; confidence{' '}
                {(s.confidence * 100).toFixed(0)} %.{' '}
                {s.events.length > 0
                  ? `Recorded before it: ${s.events.map((e) => `${eventKindLabels[e.kind]} on ${e.occurredOn}${e.note ? ` (${e.note})` : ''}`).join('; ')}.`
                  : 'No event recorded before it.'}
              </li>
            ))}
          </ul>
        )}
        <p className="mt-2 text-xs text-slate-500">{shifts.data?.method}</p>
      </div>
      {row ? (
        <div>
          <h3 className="font-medium text-slate-900">QC plan</h3>
          <p className="text-sm text-slate-800" data-testid="drilldown-qc-plan">
            {row.recommended ? `Recommended: ${describePlan(row.recommended)}. ` : ''}
            {row.explanation}
          </p>
          <p className="mt-1 text-xs text-slate-500">
            The plan informs the laboratory director&apos;s decision under local regulation and accreditation.
          </p>
        </div>
      ) : null}
      {canRecord ? (
        <form
          onSubmit={submit}
          className="grid gap-3 sm:grid-cols-4 sm:items-end"
          aria-label="Record an event"
        >
          <TextField
            label="Date"
            type="date"
            required
            value={occurredOn}
            onChange={(e) => setOccurredOn(e.target.value)}
          />
          <SelectField
            label="Kind"
            value={kind}
            onChange={(e) => setKind(e.target.value as ProcedureEventKind)}
          >
            {procedureEventKinds.map((k) => (
              <option key={k} value={k}>
                {eventKindLabels[k]}
              </option>
            ))}
          </SelectField>
          <TextField label="Note" maxLength={1000} value={note} onChange={(e) => setNote(e.target.value)} />
          <Button type="submit" isLoading={record.isPending}>
            Record event
          </Button>
          {record.isError ? (
            <div className="sm:col-span-4">
              <Alert tone="error" title="The event was not recorded">
                {errorMessage(record.error)}
              </Alert>
            </div>
          ) : null}
        </form>
      ) : null}
    </section>
  );
}
