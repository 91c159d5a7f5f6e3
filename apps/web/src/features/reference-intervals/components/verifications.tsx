import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { Verification } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { SelectField } from '../../../components/ui/select-field.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { riKeys } from '../api/ri-keys.ts';
import { useAddVerificationRound, useApproveVerification, useCreateVerification } from '../api/ri-actions.ts';
import { IntervalCaution } from './interval-caution.tsx';

/** Numbers from pasted text (one per line, or separated by commas, semicolons or spaces). */
export function parseResults(text: string): number[] | null {
  const parts = text.split(/[\s,;]+/).filter(Boolean);
  const values = parts.map(Number);
  return values.every(Number.isFinite) ? values : null;
}

const statusText = {
  accepted: 'Accepted',
  'collect-more': 'Not accepted',
  'derive-locally': 'Not accepted twice',
};

export function Verifications({ canManage }: { canManage: boolean }) {
  const list = useQuery(riKeys.verifications());
  if (list.isPending) return <PageLoading />;
  if (list.isError) return <Alert tone="error">{list.error.message}</Alert>;
  return (
    <div className="grid gap-6">
      <IntervalCaution />
      <NewVerification />
      {list.data.map((v) => (
        <VerificationCard key={v.id} v={v} canManage={canManage} />
      ))}
    </div>
  );
}

function ResultsField({
  onSubmit,
  label,
  busy,
}: {
  onSubmit: (values: number[]) => void;
  label: string;
  busy: boolean;
}) {
  const [text, setText] = useState('');
  const values = parseResults(text);
  const problem =
    values === null
      ? 'Only numbers, please.'
      : values.length !== 20
        ? `${values.length} of 20 results.`
        : undefined;
  return (
    <form
      className="grid gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        if (values && values.length === 20) onSubmit(values);
      }}
    >
      <TextareaField
        label={label}
        value={text}
        onChange={(e) => setText(e.target.value)}
        hint={problem}
        rows={4}
      />
      <div>
        <Button type="submit" disabled={!values || values.length !== 20} isLoading={busy}>
          Verify
        </Button>
      </div>
    </form>
  );
}

function NewVerification() {
  const current = useQuery(riKeys.current());
  const create = useCreateVerification();
  const [intervalId, setIntervalId] = useState('');
  return (
    <section className="grid max-w-3xl gap-3 rounded-lg border border-slate-200 p-4">
      <h2 className="text-lg font-semibold">Verify a transferred interval with 20 results</h2>
      <SelectField label="Interval" value={intervalId} onChange={(e) => setIntervalId(e.target.value)}>
        <option value="">Choose a current interval…</option>
        {current.data?.map((c) => (
          <option key={c.id} value={c.id}>
            {c.analyte.name}, {c.sex}, {c.ageLow}–{c.ageHigh} years: {c.lower}–{c.upper} {c.analyte.unit}
          </option>
        ))}
      </SelectField>
      {intervalId ? (
        <ResultsField
          label="20 results from healthy individuals (paste or type)"
          busy={create.isPending}
          onSubmit={(values) => create.mutate({ currentIntervalId: intervalId, values })}
        />
      ) : null}
      {create.isError ? <Alert tone="error">{create.error.message}</Alert> : null}
    </section>
  );
}

function VerificationCard({ v, canManage }: { v: Verification; canManage: boolean }) {
  const round = useAddVerificationRound();
  const approve = useApproveVerification();
  const [statement, setStatement] = useState('');
  return (
    <section
      className="grid gap-2 rounded-lg border border-slate-200 p-4 text-sm"
      aria-label={`Verification of ${v.analyte.name}`}
    >
      <h3 className="font-semibold">
        {v.analyte.name}: {v.interval.lower}–{v.interval.upper} {v.analyte.unit} · {statusText[v.status]}
      </h3>
      {v.rounds.map((r, i) => (
        <p key={i}>
          Set {i + 1}: {r.outside} of {r.values.length} outside ({r.accepted ? 'accepted' : 'not accepted'})
        </p>
      ))}
      <p className="font-medium">{v.nextStep}</p>
      {v.status === 'collect-more' && !v.approval ? (
        <ResultsField
          label="20 more results"
          busy={round.isPending}
          onSubmit={(values) => round.mutate({ id: v.id, values })}
        />
      ) : null}
      {v.approval ? (
        <p>
          Approved by {v.approval.approvedBy} on {v.approval.approvedAt.slice(0, 10)}: “{v.approval.statement}
          ”
        </p>
      ) : canManage ? (
        <form
          className="grid gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            approve.mutate({ id: v.id, statement });
          }}
        >
          <TextareaField
            label="Approval statement"
            value={statement}
            onChange={(e) => setStatement(e.target.value)}
            rows={2}
          />
          {approve.isError ? <Alert tone="error">{approve.error.message}</Alert> : null}
          <div>
            <Button type="submit" size="sm" isLoading={approve.isPending}>
              Approve
            </Button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
