// The monthly sign-off: once signed, who signed, when and their statement, and the period becomes
// read-only except for new comments. Before, a supervisor can sign (after a confirmation); an analyst
// sees that the month waits for the supervisor.
import { useId, useState } from 'react';
import { useQuery } from '@tanstack/react-query';
import { SIGNOFF_STATEMENT_MAX_LENGTH, type Signoff } from '@plumbline/contracts';
import { Alert } from '../../../components/ui/alert.tsx';
import { Button } from '../../../components/ui/button.tsx';
import { ConfirmDialog } from '../../../components/ui/confirm-dialog.tsx';
import { Spinner } from '../../../components/ui/spinner.tsx';
import { TextareaField } from '../../../components/ui/textarea-field.tsx';
import { showToast } from '../../../components/ui/toast.tsx';
import { errorMessage } from '../../../lib/form-errors.ts';
import { formatDateTime, formatPeriod } from '../../../utils/format.ts';
import { labReviewKeys } from '../api/lab-review-keys.ts';
import { useSignPeriod } from '../api/signoff.ts';

export function SignedBanner({ signoff }: { signoff: Signoff }) {
  return (
    <div data-testid="signoff-signed" className="rounded-lg border border-plumb-300 bg-plumb-50 px-5 py-4">
      <p className="flex flex-wrap items-center gap-2 text-sm font-semibold text-plumb-900">
        <svg width="16" height="16" viewBox="0 0 16 16" aria-hidden="true" focusable="false">
          <rect x="3" y="7" width="10" height="7" rx="1.5" fill="var(--color-plumb-700)" />
          <path
            d="M5.5 7V5a2.5 2.5 0 0 1 5 0v2"
            fill="none"
            stroke="var(--color-plumb-700)"
            strokeWidth="1.5"
          />
        </svg>
        <span>
          Signed off by {signoff.signedBy.name} on{' '}
          <time dateTime={signoff.signedAt}>{formatDateTime(signoff.signedAt)}</time>
        </span>
      </p>
      <blockquote className="mt-2 border-l-2 border-plumb-300 pl-3 text-sm whitespace-pre-line text-slate-800">
        {signoff.statement}
      </blockquote>
      <p className="mt-2 text-xs text-slate-600">
        The review of {formatPeriod(signoff.period)} is read-only. New corrective-action comments can still be
        added.
      </p>
    </div>
  );
}

export function SignoffPanel({
  labId,
  period,
  canSign,
  flaggedWithoutComment = 0,
}: {
  labId: string;
  period: string;
  /** Supervisors sign; analysts see the state only. */
  canSign: boolean;
  /** Flagged rows nobody has commented on yet: the supervisor is told before signing. */
  flaggedWithoutComment?: number;
}) {
  const headingId = useId();
  const signoff = useQuery(labReviewKeys.signoff(labId, period));
  const sign = useSignPeriod();
  const [statement, setStatement] = useState('');
  const [missing, setMissing] = useState(false);
  const [confirming, setConfirming] = useState(false);

  if (signoff.isPending) return <Spinner label="Loading the sign-off" />;
  if (signoff.isError) {
    return (
      <Alert tone="error" title="The sign-off could not be loaded">
        {errorMessage(signoff.error)}
      </Alert>
    );
  }
  if (signoff.data.signoff) return <SignedBanner signoff={signoff.data.signoff} />;

  if (!canSign) {
    return (
      <p
        data-testid="signoff-open"
        className="rounded-lg border border-dashed border-slate-300 bg-white px-5 py-3 text-sm text-slate-700"
      >
        <span className="font-semibold text-slate-900">Not signed off yet.</span> Your supervisor signs{' '}
        {formatPeriod(period)} off once the flagged results are looked into and commented.
      </p>
    );
  }

  return (
    <section
      aria-labelledby={headingId}
      data-testid="signoff-open"
      className="rounded-lg border border-slate-200 bg-white px-5 py-4 shadow-xs"
    >
      <h2 id={headingId} className="text-base font-semibold text-plumb-950">
        Sign off {formatPeriod(period)}
      </h2>
      <p className="mt-1 text-sm text-slate-700">
        Signing records that you reviewed this month’s results and the corrective actions taken. After
        signing, the review is read-only; comments can still be added.
      </p>
      {flaggedWithoutComment > 0 ? (
        <p className="mt-2 text-sm font-medium text-brass-700">
          {flaggedWithoutComment} flagged result{flaggedWithoutComment === 1 ? ' has' : 's have'} no comment
          yet.
        </p>
      ) : null}
      <form
        noValidate
        className="mt-3 flex flex-col gap-3"
        onSubmit={(event) => {
          event.preventDefault();
          if (statement.trim() === '') {
            setMissing(true);
            return;
          }
          setConfirming(true);
        }}
      >
        <TextareaField
          label="Sign-off statement"
          hint="What you reviewed and concluded, e.g. which flags were investigated and what was done."
          rows={3}
          maxLength={SIGNOFF_STATEMENT_MAX_LENGTH}
          value={statement}
          error={missing ? 'write the sign-off statement' : undefined}
          onChange={(event) => {
            setStatement(event.target.value);
            setMissing(false);
          }}
        />
        <div>
          <Button type="submit">Sign off {formatPeriod(period)}</Button>
        </div>
      </form>
      <ConfirmDialog
        open={confirming}
        onClose={() => {
          setConfirming(false);
          sign.reset();
        }}
        title={`Sign off ${formatPeriod(period)}?`}
        confirmLabel="Sign off"
        isPending={sign.isPending}
        error={sign.isError ? errorMessage(sign.error) : null}
        onConfirm={() =>
          sign.mutate(
            { labId, body: { period, statement: statement.trim() } },
            {
              onSuccess: () => {
                setConfirming(false);
                showToast(`${formatPeriod(period)} signed off`);
              },
            },
          )
        }
      >
        <p>
          Your name and the time are recorded with your statement, and the review becomes read-only. This
          cannot be undone.
        </p>
        <blockquote className="border-l-2 border-plumb-300 pl-3 text-sm whitespace-pre-line">
          {statement.trim()}
        </blockquote>
      </ConfirmDialog>
    </section>
  );
}
