import { REFERENCE_INTERVAL_CAUTION } from '@plumbline/contracts';

/** The caution shown beside every reference interval. */
export function IntervalCaution() {
  return (
    <p
      role="note"
      className="rounded-md border border-brass-300 bg-brass-50 px-4 py-3 text-sm text-slate-800"
    >
      <strong className="font-semibold">Caution: </strong>
      {REFERENCE_INTERVAL_CAUTION}
    </p>
  );
}
