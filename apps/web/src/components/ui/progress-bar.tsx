/**
 * A determinate progress bar, announced as a progressbar with its percentage. `valueText` replaces the
 * number for assistive technology when a plain percentage would mislead (e.g. "waiting to start").
 */
export function ProgressBar({
  label,
  value,
  valueText,
}: {
  label: string;
  /** 0..1 */
  value: number;
  valueText?: string;
}) {
  const percent = Math.round(Math.min(1, Math.max(0, Number.isFinite(value) ? value : 0)) * 100);
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={percent}
      aria-valuetext={valueText ?? `${percent}%`}
      className="h-3 w-full overflow-hidden rounded-full bg-plumb-100 ring-1 ring-plumb-200 ring-inset"
    >
      <div
        className="h-full rounded-full bg-plumb-600 transition-[width] duration-500 ease-out"
        style={{ width: `${percent}%` }}
      />
    </div>
  );
}
