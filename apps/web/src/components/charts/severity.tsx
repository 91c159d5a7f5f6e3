// The severity of a flag in Plumbline's own visual language: every level has a word, a shape and a
// colour, so it never depends on colour alone. The same shapes mark points on the charts.
import type { ReactNode } from 'react';
import { symbol, symbolCircle, symbolDiamond, symbolSquare, symbolTriangle, type SymbolType } from 'd3';

export type Severity = 'fine' | 'acceptable' | 'warning' | 'action';

export const severityOrder: readonly Severity[] = ['fine', 'acceptable', 'warning', 'action'];

export const severityLabels: Record<Severity, string> = {
  fine: 'Fine',
  acceptable: 'Acceptable',
  warning: 'Warning',
  action: 'Action',
};

/** One line on what the severity asks of the lab. */
export const severityMeanings: Record<Severity, string> = {
  fine: 'no action',
  acceptable: 'keep an eye on it',
  warning: 'look into it',
  action: 'investigate and document what was done',
};

type SeverityStyle = { symbol: SymbolType; fill: string; stroke: string; text: string; chip: string };

// Shapes: a dot, an open ring, a triangle and a square diamond; colours from the app's palette.
export const severityStyles: Record<Severity, SeverityStyle> = {
  fine: {
    symbol: symbolCircle,
    fill: 'var(--color-plumb-600)',
    stroke: 'var(--color-plumb-700)',
    text: 'text-plumb-800',
    chip: 'bg-plumb-50 ring-plumb-200',
  },
  acceptable: {
    symbol: symbolCircle,
    fill: 'white',
    stroke: 'var(--color-slate-500)',
    text: 'text-slate-700',
    chip: 'bg-white ring-slate-300',
  },
  warning: {
    symbol: symbolTriangle,
    fill: 'var(--color-brass-400)',
    stroke: 'var(--color-brass-700)',
    text: 'text-brass-700',
    chip: 'bg-brass-100 ring-brass-300',
  },
  action: {
    symbol: symbolDiamond,
    fill: 'var(--color-alarm-700)',
    stroke: 'var(--color-alarm-800)',
    text: 'text-alarm-800',
    chip: 'bg-alarm-50 ring-alarm-200',
  },
};

/** An SVG path of a marker shape centred on 0,0; `area` is in square viewBox units. */
export function markerPath(shape: SymbolType, area: number): string {
  return symbol(shape, area)() ?? '';
}

export const ownLabShape = symbolSquare;

/** The shape of a severity, drawn inline beside its word (decorative: the word carries the meaning). */
export function SeverityIcon({ severity, size = 12 }: { severity: Severity; size?: number }) {
  const style = severityStyles[severity];
  return (
    <svg
      width={size}
      height={size}
      viewBox="-7 -7 14 14"
      aria-hidden="true"
      focusable="false"
      className="shrink-0"
    >
      <path d={markerPath(style.symbol, 70)} fill={style.fill} stroke={style.stroke} strokeWidth={1.5} />
    </svg>
  );
}

/** A severity as a small chip: shape, colour and word. */
export function SeverityChip({ severity, children }: { severity: Severity; children?: ReactNode }) {
  const style = severityStyles[severity];
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-xs font-medium whitespace-nowrap ring-1 ring-inset ${style.chip} ${style.text}`}
    >
      <SeverityIcon severity={severity} />
      {children ?? severityLabels[severity]}
    </span>
  );
}

/** The worst of several severities (null when there are none). */
export function worstSeverity(severities: readonly Severity[]): Severity | null {
  let worst: Severity | null = null;
  for (const severity of severities) {
    if (worst === null || severityOrder.indexOf(severity) > severityOrder.indexOf(worst)) worst = severity;
  }
  return worst;
}
