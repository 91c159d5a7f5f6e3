import type { ReactNode } from 'react';

const tones = {
  neutral: 'bg-slate-100 text-slate-700 ring-slate-200',
  plumb: 'bg-plumb-50 text-plumb-800 ring-plumb-200',
  solid: 'bg-plumb-700 text-white ring-plumb-700',
  brass: 'bg-brass-100 text-brass-700 ring-brass-300',
  alarm: 'bg-alarm-50 text-alarm-800 ring-alarm-200',
  muted: 'bg-white text-slate-500 ring-slate-200',
} as const;

export type BadgeTone = keyof typeof tones;

/** A small status label in a table cell ("Active", "Retired", "Late"). */
export function Badge({ tone = 'neutral', children }: { tone?: BadgeTone; children: ReactNode }) {
  return (
    <span
      className={`inline-flex items-center rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ring-1 ring-inset ${tones[tone]}`}
    >
      {children}
    </span>
  );
}
