// The publication column of a period: publishing (freezing a versioned snapshot of the peer
// statistics) and republishing with a reason, from the publishing feature.
import type { Period } from '@plumbline/contracts';
import { PeriodPublishing } from '../../publishing/components/period-publishing.tsx';

export function PeriodPublication({ period }: { period: Period }) {
  return <PeriodPublishing period={period} />;
}
