import type { ControlLotSummary, Period } from '@plumbline/contracts';

/**
 * The period a coordinator is most likely arranging peer groups for: the oldest one not yet
 * published (the next to publish); the latest period when every one is published. Null without periods.
 */
export function defaultPeerGroupPeriod(periods: readonly Period[]): string | null {
  const sorted = [...periods].sort((a, b) => a.period.localeCompare(b.period));
  return sorted.find((p) => p.state !== 'published')?.period ?? sorted.at(-1)?.period ?? null;
}

/** The lot in use longest from now: the one that expires last. */
export function defaultControlLot(lots: readonly ControlLotSummary[]): ControlLotSummary | null {
  return [...lots].sort((a, b) => b.expiresOn.localeCompare(a.expiresOn))[0] ?? null;
}
