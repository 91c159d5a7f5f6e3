// Confirmation before an action that changes what others see or cannot simply be undone (deactivate a
// lab, retire a catalogue entry, close a period). Optionally asks for a reason, kept in the audit log.
import { useState, type ReactNode } from 'react';
import { Alert } from './alert.tsx';
import { Button } from './button.tsx';
import { Dialog, DialogActions } from './dialog.tsx';
import { TextareaField } from './textarea-field.tsx';

export function ConfirmDialog({
  open,
  onClose,
  title,
  children,
  confirmLabel,
  tone = 'primary',
  reason = 'none',
  reasonLabel = 'Reason (kept in the audit log)',
  isPending = false,
  error,
  onConfirm,
}: {
  open: boolean;
  onClose: () => void;
  title: string;
  children: ReactNode;
  confirmLabel: string;
  tone?: 'primary' | 'danger';
  reason?: 'none' | 'optional' | 'required';
  reasonLabel?: string;
  isPending?: boolean;
  /** The API's answer when the action failed; the dialog stays open. */
  error?: string | null;
  onConfirm: (reason: string) => void;
}) {
  return (
    <Dialog open={open} onClose={onClose} title={title} size="sm">
      {/* Keyed on `open`, so a second opening starts with an empty reason. */}
      <ConfirmBody
        key={String(open)}
        {...{ onClose, children, confirmLabel, tone, reason, reasonLabel, isPending, error, onConfirm }}
      />
    </Dialog>
  );
}

function ConfirmBody({
  onClose,
  children,
  confirmLabel,
  tone,
  reason,
  reasonLabel,
  isPending,
  error,
  onConfirm,
}: {
  onClose: () => void;
  children: ReactNode;
  confirmLabel: string;
  tone: 'primary' | 'danger';
  reason: 'none' | 'optional' | 'required';
  reasonLabel: string;
  isPending: boolean;
  error?: string | null;
  onConfirm: (reason: string) => void;
}) {
  const [text, setText] = useState('');
  const [missing, setMissing] = useState(false);
  return (
    <form
      noValidate
      onSubmit={(event) => {
        event.preventDefault();
        if (reason === 'required' && text.trim() === '') {
          setMissing(true);
          return;
        }
        onConfirm(text.trim());
      }}
    >
      <div className="space-y-3 text-[0.95rem] text-slate-700">{children}</div>
      {reason !== 'none' ? (
        <TextareaField
          className="mt-4"
          label={reason === 'required' ? reasonLabel : `${reasonLabel}, optional`}
          value={text}
          onChange={(event) => {
            setText(event.target.value);
            setMissing(false);
          }}
          error={missing ? 'say why; the reason is kept in the audit log' : undefined}
          maxLength={500}
        />
      ) : null}
      {error ? (
        <div className="mt-4">
          <Alert tone="error">{error}</Alert>
        </div>
      ) : null}
      <DialogActions>
        {/* Without a reason to type, focus starts on the safer choice for destructive actions. */}
        <Button variant="secondary" onClick={onClose} data-autofocus={tone === 'danger' || undefined}>
          Cancel
        </Button>
        <Button
          type="submit"
          variant={tone}
          isLoading={isPending}
          data-autofocus={tone !== 'danger' || undefined}
        >
          {confirmLabel}
        </Button>
      </DialogActions>
    </form>
  );
}
