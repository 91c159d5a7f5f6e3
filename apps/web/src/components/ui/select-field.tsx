import { useId, type ComponentProps, type ReactNode } from 'react';

type SelectFieldProps = ComponentProps<'select'> & {
  label: string;
  error?: string;
  hint?: string;
  children: ReactNode;
};

/** A labelled <select>, styled and wired (hint, error, aria-invalid) like TextField. */
export function SelectField({
  label,
  error,
  hint,
  id,
  className = '',
  children,
  ...selectProps
}: SelectFieldProps) {
  const generatedId = useId();
  const selectId = id ?? generatedId;
  const hintId = hint ? `${selectId}-hint` : undefined;
  const errorId = error ? `${selectId}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={`flex flex-col gap-1.5 ${className}`}>
      <label htmlFor={selectId} className="text-sm font-medium text-slate-800">
        {label}
      </label>
      <select
        id={selectId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`h-10 rounded-md border bg-white px-2.5 text-[0.95rem] text-slate-900 shadow-xs ${
          error ? 'border-alarm-700' : 'border-slate-300 hover:border-slate-400'
        }`}
        {...selectProps}
      >
        {children}
      </select>
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
