// A notice for the coordinator: peer groups whose figures the last recompute could not compute, with
// the reason. The other groups were computed; the notice goes away once a recompute computes them.
import { useQuery } from '@tanstack/react-query';
import type { PeerStatisticsFailure } from '@plumbline/contracts';
import { formatDateTime } from '../../../utils/format.ts';
import { peerGroupsKeys } from '../api/peer-groups-keys.ts';

const tierWords: Record<PeerStatisticsFailure['tier'], string> = {
  instrument: 'instrument group',
  method: 'method group',
  analyte: 'analyte group',
};

/** Shows nothing while loading, on error or when every group was computed. */
export function RecomputeFailuresNotice({ period }: { period?: string }) {
  const failures = useQuery(peerGroupsKeys.failures(period));
  const list = failures.data ?? [];
  if (list.length === 0) return null;
  return (
    <section
      aria-labelledby="recompute-failures-title"
      data-recompute-failures=""
      className="mb-6 rounded-md border border-alarm-200 bg-alarm-50 px-4 py-3 text-sm text-slate-800"
    >
      <h2 id="recompute-failures-title" className="font-semibold text-alarm-800">
        {list.length === 1
          ? 'The figures of 1 peer group could not be computed'
          : `The figures of ${list.length} peer groups could not be computed`}
      </h2>
      <p className="mt-0.5 text-xs text-slate-700">
        Every other group was computed as usual. Labs compared with these groups see the row as “cannot be
        computed” with the reason; the next recompute that succeeds clears the notice.
      </p>
      <ul className="mt-2 space-y-1">
        {list.map((f) => (
          <li key={`${f.peerGroupId}/${f.level}/${f.period}/${f.scope}`}>
            <span className="font-medium">
              {f.analyte.name}, lot {f.controlLot.lotNumber}, level {f.level}, {f.period}
              {f.scope === 'cumulative' ? ' (lot to date)' : ''}
            </span>{' '}
            <span className="text-slate-600">
              — {tierWords[f.tier]} “{f.groupLabel}”: {f.reason}
            </span>{' '}
            <span className="text-xs text-slate-500">({formatDateTime(f.failedAt)})</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
