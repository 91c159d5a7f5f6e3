// Sizes and scales shared by the charts. Every chart draws in its own fixed coordinate system (the
// SVG viewBox) and scales to the width of its container, so positions in tests are viewBox units.

export type Margin = { top: number; right: number; bottom: number; left: number };
export type ChartSize = { width: number; height: number; margin: Margin };

/** The drawing area inside the margins, as [start, end] ranges for d3 scales. */
export function plotArea(size: ChartSize) {
  const { width, height, margin } = size;
  return {
    left: margin.left,
    right: width - margin.right,
    top: margin.top,
    bottom: height - margin.bottom,
    xRange: [margin.left, width - margin.right] as [number, number],
    /** SVG y grows downwards: the smallest value sits at the bottom. */
    yRange: [height - margin.bottom, margin.top] as [number, number],
  };
}

/**
 * A symmetric SDI axis: ±4 SD at least, so the ±2 and ±3 guides always show, widened to the next
 * whole SD when a value lies further out.
 */
export function symmetricSdiLimit(values: readonly (number | null | undefined)[], minimum = 4): number {
  let largest = 0;
  for (const value of values) {
    if (value !== null && value !== undefined && Number.isFinite(value))
      largest = Math.max(largest, Math.abs(value));
  }
  return Math.max(minimum, Math.ceil(largest + 0.25));
}

/** A signed figure: "+1.25", "−0.40" (a true minus sign), "0.00". */
export function formatSigned(value: number, digits = 2): string {
  const text = Math.abs(value).toFixed(digits);
  if (Number(text) === 0) return text;
  return `${value > 0 ? '+' : '\u2212'}${text}`;
}
