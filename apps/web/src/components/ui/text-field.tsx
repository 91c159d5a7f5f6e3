import { useId, type ComponentProps } from 'react';

/** Contract messages are written in lower case ("enter your password"); shown alone they start a sentence. */
function asSentence(message: string): string {
  return message.charAt(0).toUpperCase() + message.slice(1);
}

type TextFieldProps = ComponentProps<'input'> & {
  label: string;
  /** Shown under the field and announced with it; marks the field invalid. */
  error?: string;
  hint?: string;
};

export function TextField({ label, error, hint, id, className = '', ...inputProps }: TextFieldProps) {
  const generatedId = useId();
  const inputId = id ?? generatedId;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = error ? `${inputId}-error` : undefined;
  const describedBy = [hintId, errorId].filter(Boolean).join(' ') || undefined;

  return (
    <div className={`flex flex-col gap-1.5 ${className}`}>
      <label htmlFor={inputId} className="text-sm font-medium text-slate-800">
        {label}
      </label>
      <input
        id={inputId}
        aria-invalid={error ? true : undefined}
        aria-describedby={describedBy}
        className={`h-10 rounded-md border bg-white px-3 text-[0.95rem] text-slate-900 shadow-xs placeholder:text-slate-400 ${
          error ? 'border-alarm-700' : 'border-slate-300 hover:border-slate-400'
        }`}
        {...inputProps}
      />
      {hint ? (
        <p id={hintId} className="text-xs text-slate-600">
          {hint}
        </p>
      ) : null}
      {error ? (
        <p id={errorId} className="text-sm font-medium text-alarm-700">
          {asSentence(error)}
        </p>
      ) : null}
    </div>
  );
}
