import { useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import type { PartitionResult, StudyDetail, StudyResult } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { PageLoading } from '../../../components/ui/page-loading.tsx';
import { ProgressBar } from '../../../components/ui/progress-bar.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { downloadStudyCsv, downloadStudyPdf, isRunning, riKeys } from '../api/ri-keys.ts';
import { useAdoptInterval, useApproveStudy, useRunStudy } from '../api/ri-actions.ts';
import { IntervalCaution } from './interval-caution.tsx';
import { IntervalHistogram } from './interval-histogram.tsx';

const fmt = (v: number) => (Math.abs(v) >= 100 ? v.toFixed(1) : v.toPrecision(3));
const limitText = (l: PartitionResult['lower']) =>
  l ? `${fmt(l.value)}${l.ci ? ` (90 % CI ${fmt(l.ci[0])}–${fmt(l.ci[1])})` : ''}` : '—';

export function StudyView({ studyId, canManage }: { studyId: string; canManage: boolean }) {
  const study = useQuery({
    ...riKeys.study(studyId),
    refetchInterval: (q) => (isRunning(q.state.data?.status) ? 1000 : false),
  });
  const run = useRunStudy();
  if (study.isPending) return <PageLoading />;
  if (study.isError) return <Alert tone="error">{study.error.message}</Alert>;
  const s = study.data;
  const [latest] = s.results;
  return (
    <div className="grid gap-6">
      <IntervalCaution />
      <p className="text-sm text-slate-700">
        {s.analyte.name} · ages {s.selection.ageLow}–{s.selection.ageHigh} · method {s.method} · screening{' '}
        {s.screening}
      </p>
      {isRunning(s.status) ? (
        <div aria-live="polite">
          <p className="text-sm">The study is {s.status}…</p>
          <ProgressBar value={s.progress} label="Study progress" />
        </div>
      ) : null}
      {s.status === 'failed' ? <Alert tone="error">{s.failureMessage}</Alert> : null}
      {canManage && !isRunning(s.status) ? (
        <div>
          <Button variant="secondary" onClick={() => run.mutate(s.id)} isLoading={run.isPending}>
            Run again (adds a new version)
          </Button>
        </div>
      ) : null}
      {latest ? <ResultView study={s} result={latest} canManage={canManage} /> : null}
      {s.results.length > 1 ? (
        <details>
          <summary className="cursor-pointer text-sm font-medium">Earlier versions</summary>
          {s.results.slice(1).map((r) => (
            <ResultView key={r.id} study={s} result={r} canManage={canManage} />
          ))}
        </details>
      ) : null}
    </div>
  );
}

function ResultView({
  study,
  result,
  canManage,
}: {
  study: StudyDetail;
  result: StudyResult;
  canManage: boolean;
}) {
  const approve = useApproveStudy();
  const adopt = useAdoptInterval();
  const [statement, setStatement] = useState('');
  return (
    <section
      className="grid gap-4 rounded-lg border border-slate-200 p-4"
      aria-label={`Version ${result.version}`}
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 className="text-lg font-semibold">
          Version {result.version}
          {result.approval ? ' · approved' : ''}
        </h2>
        <div className="flex gap-2">
          <Button
            size="sm"
            variant="secondary"
            onClick={() => void downloadStudyCsv(study.id, result.version)}
          >
            CSV
          </Button>
          <Button
            size="sm"
            variant="secondary"
            onClick={() => void downloadStudyPdf(study.id, result.version)}
          >
            PDF
          </Button>
        </div>
      </div>
      {result.partitions.map((p) => (
        <div key={p.label} className="grid gap-2 border-t border-slate-100 pt-3">
          <h3 className="font-semibold">{p.label}</h3>
          <dl className="grid grid-cols-2 gap-x-6 gap-y-1 text-sm md:grid-cols-4">
            <dt className="text-slate-600">n</dt>
            <dd>{p.n}</dd>
            <dt className="text-slate-600">Excluded as outliers</dt>
            <dd>{p.excludedCount}</dd>
            <dt className="text-slate-600">Lower limit</dt>
            <dd data-testid="lower-limit">
              {limitText(p.lower)} {result.unit}
            </dd>
            <dt className="text-slate-600">Upper limit</dt>
            <dd data-testid="upper-limit">
              {limitText(p.upper)} {result.unit}
            </dd>
            <dt className="text-slate-600">In use today</dt>
            <dd className="col-span-3">
              {p.current
                ? `${p.current.lower}–${p.current.upper} ${result.unit} (${p.current.source})`
                : 'none entered'}
            </dd>
          </dl>
          {p.note ? <p className="text-sm text-slate-700">{p.note}</p> : null}
          <IntervalHistogram partition={p} unit={result.unit} />
          {p.excluded.length ? (
            <details className="text-sm">
              <summary className="cursor-pointer">Excluded values ({p.excludedCount})</summary>
              <p className="mt-1 break-words">{p.excluded.join(', ')}</p>
            </details>
          ) : null}
          {canManage && result.approval && p.lower && p.upper ? (
            <div>
              <Button
                size="sm"
                variant="secondary"
                onClick={() => adopt.mutate({ resultId: result.id, partition: p.label })}
              >
                Adopt as the current interval
              </Button>
            </div>
          ) : null}
        </div>
      ))}
      {result.advice.length ? (
        <div className="grid gap-1 border-t border-slate-100 pt-3 text-sm">
          <h3 className="font-semibold">Partition advice</h3>
          {result.advice.map((a) => (
            <p key={a.between.join('|')}>{a.advice}</p>
          ))}
        </div>
      ) : null}
      {adopt.isSuccess ? <Alert tone="info">Adopted as the lab’s current interval.</Alert> : null}
      {result.approval ? (
        <p className="text-sm">
          Approved by {result.approval.approvedBy} on {result.approval.approvedAt.slice(0, 10)}: “
          {result.approval.statement}”
        </p>
      ) : canManage ? (
        <form
          className="grid gap-2"
          onSubmit={(e) => {
            e.preventDefault();
            approve.mutate({ studyId: study.id, version: result.version, statement });
          }}
        >
          <TextareaField
            label="Approval statement"
            value={statement}
            onChange={(e) => setStatement(e.target.value)}
            hint="Say who reviewed the result and for which use (at least 10 characters)."
          />
          {approve.isError ? <Alert tone="error">{approve.error.message}</Alert> : null}
          <div>
            <Button type="submit" isLoading={approve.isPending}>
              Approve version {result.version}
            </Button>
          </div>
        </form>
      ) : null}
    </section>
  );
}
