// The lab's QC plans: every procedure and level with its sigma, the plan it uses and the recommended
// plan; a row opens its power curves and lets analysts and supervisors enter the plan in use.
import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { qcPlanRuleNames, type QcPlanRow } from '@plumbline/contracts';
import type { QcPlanRule } from '@plumbline/stats';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { EmptyState } from '../../../components/ui/empty-state.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { TextField } from '../../../components/ui/text-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatPeriod } from '../../../utils/format.ts';
import { qcInsightKeys, saveQcPlan } from '../api/qc-insight-keys.ts';
import { describePlan } from './plan-text.ts';
import { PowerCurveChart } from './power-curve-chart.tsx';

const rowKey = (row: QcPlanRow) => `${row.procedure.id}-${row.controlLot}-${row.level}`;

export function QcPlanTable({ labId, canEdit }: { labId: string; canEdit: boolean }) {
  const page = useQuery(qcInsightKeys.qcPlan(labId));
  const [open, setOpen] = useState<string | null>(null);
  if (page.isError) {
    return (
      <Alert tone="error" title="The QC plans could not be loaded">
        {errorMessage(page.error)}
      </Alert>
    );
  }
  if (!page.data) return <Spinner label="Computing the QC plans" />;
  if (page.data.rows.length === 0) {
    return (
      <EmptyState
        title="No data yet"
        description="QC plans are computed from the sigma of your procedures once a month of data is in."
      />
    );
  }
  const { minPed, maxPfr } = page.data.settings;
  return (
    <div className="space-y-4">
      <p className="text-sm text-slate-700">
        From {formatPeriod(page.data.period ?? '')}: sigma = (TEa − |bias|) / CV, critical shift ΔSEcrit = σ −
        1.65. The recommended plan is the one with the fewest controls that detects ΔSEcrit with probability ≥{' '}
        {minPed} and rejects a good run with probability ≤ {maxPfr}. The plan informs the laboratory
        director&apos;s decision under local regulation and accreditation.
      </p>
      <table className="w-full text-left text-sm" data-testid="qc-plan-table">
        <thead>
          <tr className="border-b text-slate-600">
            <th className="py-2">Procedure</th>
            <th>Lot · level</th>
            <th>Sigma</th>
            <th>Current plan</th>
            <th>Recommended plan</th>
            <th />
          </tr>
        </thead>
        <tbody>
          {page.data.rows.map((row) => (
            <PlanRow
              key={rowKey(row)}
              row={row}
              labId={labId}
              canEdit={canEdit}
              minPed={minPed}
              open={open === rowKey(row)}
              onToggle={() => setOpen(open === rowKey(row) ? null : rowKey(row))}
            />
          ))}
        </tbody>
      </table>
    </div>
  );
}

function PlanRow({
  row,
  labId,
  canEdit,
  minPed,
  open,
  onToggle,
}: {
  row: QcPlanRow;
  labId: string;
  canEdit: boolean;
  minPed: number;
  open: boolean;
  onToggle: () => void;
}) {
  const queryClient = useQueryClient();
  const [rules, setRules] = useState(row.current?.rules.join('/') ?? '1-3s');
  const [n, setN] = useState(String(row.current?.n ?? 2));
  const save = useMutation({
    mutationFn: () =>
      saveQcPlan(labId, row.procedure.id, row.level, {
        rules: rules.split('/').map((r) => r.trim()) as (typeof qcPlanRuleNames)[number][],
        n: Number(n),
        runs: 1,
      }),
    onSuccess: async () => {
      showToast('Plan saved.');
      await queryClient.invalidateQueries({ queryKey: qcInsightKeys.all });
    },
  });
  const plans = [
    ...(row.recommended
      ? [
          {
            label: `Recommended: ${describePlan({ ...row.recommended, pfr: undefined })}`,
            plan: { ...row.recommended, rules: row.recommended.rules as QcPlanRule[] },
          },
        ]
      : []),
    ...(row.current
      ? [
          {
            label: `Current: ${describePlan({ ...row.current, pfr: undefined })}`,
            plan: { ...row.current, rules: row.current.rules as QcPlanRule[] },
          },
        ]
      : []),
  ];
  return (
    <>
      <tr className="border-b align-top">
        <td className="py-2">
          {row.procedure.code} <span className="text-slate-500">{row.analyte}</span>
        </td>
        <td>
          {row.controlLot} · {row.level}
        </td>
        <td>{row.sigma === null ? '—' : row.sigma.toFixed(1)}</td>
        <td>{row.current ? describePlan(row.current) : 'not entered'}</td>
        <td>
          {row.recommended ? describePlan(row.recommended) : '—'}
          {row.reached === false ? (
            <span className="block text-xs text-alarm-700">targets not reached</span>
          ) : null}
        </td>
        <td>
          <Button variant="secondary" size="sm" onClick={onToggle} aria-expanded={open}>
            {open ? 'Hide' : 'Details'}
          </Button>
        </td>
      </tr>
      {open ? (
        <tr>
          <td colSpan={6} className="space-y-3 py-3">
            <p className="text-sm text-slate-800">{row.explanation}</p>
            {row.teaSource ? <p className="text-xs text-slate-500">TEa source: {row.teaSource}</p> : null}
            {plans.length > 0 ? (
              <PowerCurveChart plans={plans} deltaSeCrit={row.deltaSeCrit} minPed={minPed} />
            ) : null}
            {canEdit ? (
              <form
                className="flex flex-wrap items-end gap-3"
                aria-label="Plan in use"
                onSubmit={(e) => {
                  e.preventDefault();
                  save.mutate();
                }}
              >
                <TextField
                  label={`Rules in use (${qcPlanRuleNames.join(', ')}; join with /)`}
                  value={rules}
                  onChange={(e) => setRules(e.target.value)}
                />
                <TextField
                  label="Controls per run"
                  type="number"
                  min={1}
                  max={10}
                  value={n}
                  onChange={(e) => setN(e.target.value)}
                />
                <Button type="submit" isLoading={save.isPending}>
                  Save plan in use
                </Button>
                {save.isError ? <p className="text-sm text-alarm-700">{errorMessage(save.error)}</p> : null}
              </form>
            ) : null}
          </td>
        </tr>
      ) : null}
    </>
  );
}
