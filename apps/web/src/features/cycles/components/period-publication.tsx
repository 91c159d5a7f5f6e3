// The publication column of a period. Publishing (freezing a versioned snapshot of the peer
// statistics) and republishing with a reason plug in here, once peer statistics can be frozen;
// until then this only says where a period stands.
import type { Period } from '@plumbline/contracts';

export function PeriodPublication({ period }: { period: Period }) {
  if (period.state === 'published') return <span className="text-sm text-slate-700">Reports published</span>;
  if (period.state === 'closed') return <span className="text-sm text-slate-600">Ready to publish</span>;
  return <span className="text-sm text-slate-400">Close the period first</span>;
}
