import { useId, type ComponentProps } from 'react';

type TextareaFieldProps = ComponentProps<'textarea'> & { label: string; error?: string; hint?: string };

/** A labelled multi-line field, styled and wired like TextField (used for reasons kept in the audit log). */
export function TextareaField({
  label,
  error,
  hint,
  id,
  className = '',
  ...textareaProps
}: TextareaFieldProps) {
  const generatedId = useId();
  const textareaId = id ?? generatedId;
  const hintId = hint ? `${textareaId}-hint` : undefined;
  const errorId = error ? `${textareaId}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1.5 ${className}`}>
      <label htmlFor={textareaId} className="text-sm font-medium text-slate-800">
        {label}
      </label>
      <textarea
        id={textareaId}
        rows={2}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`rounded-md border bg-white px-3 py-2 text-[0.95rem] text-slate-900 shadow-xs placeholder:text-slate-400 ${
          error ? 'border-alarm-700' : 'border-slate-300 hover:border-slate-400'
        }`}
        {...textareaProps}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-slate-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm font-medium text-alarm-700">
          {error.charAt(0).toUpperCase() + error.slice(1)}
        </p>
      ) : null}
    </div>
  );
}
