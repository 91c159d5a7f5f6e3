import type { Executor } from '@plumbline/db';
import type { ParticipationFlag } from '@plumbline/contracts';

/**
 * EXTENSION POINT for the participation board: action-level flags per lab for a period —
 * |SDI| > 3, CVR > 2, or the lab's data excluded as an outlier from the peer figures.
 *
 * These need the peer statistics of the period (peer mean, SD and CV per group and level, and the
 * exclusions they record), which the peer-statistics recompute produces. Until that is wired in,
 * no flags are reported: the board shows participation only. Replace the body, keep the signature.
 */
export async function participationFlags(
  _db: Executor,
  _period: string,
  labIds: readonly string[],
): Promise<Map<string, ParticipationFlag[]>> {
  return new Map(labIds.map((id) => [id, []]));
}
