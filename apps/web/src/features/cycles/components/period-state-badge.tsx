import type { PeriodState } from '@plumbline/contracts';
import { Badge, type BadgeTone } from '../../../components/ui/badge.tsx';

export const periodStateLabels: Record<PeriodState, string> = {
  open: 'Open',
  closed: 'Closed',
  published: 'Published',
};

const tones: Record<PeriodState, BadgeTone> = { open: 'plumb', closed: 'brass', published: 'solid' };

export function PeriodStateBadge({ state }: { state: PeriodState }) {
  return <Badge tone={tones[state]}>{periodStateLabels[state]}</Badge>;
}
