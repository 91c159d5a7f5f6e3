import type { ReactNode } from 'react';

const tones = {
  error: 'border-alarm-200 bg-alarm-50 text-alarm-800',
  info: 'border-plumb-200 bg-plumb-50 text-plumb-900',
} as const;

/** A message box; errors are announced to screen readers as soon as they appear. */
export function Alert({
  tone,
  title,
  children,
}: {
  tone: keyof typeof tones;
  title?: string;
  children: ReactNode;
}) {
  return (
    <div
      role={tone === 'error' ? 'alert' : 'status'}
      className={`rounded-md border px-4 py-3 text-sm ${tones[tone]}`}
    >
      {title ? <p className="font-semibold">{title}</p> : null}
      <div className={title ? 'mt-0.5' : undefined}>{children}</div>
    </div>
  );
}
