import { listPeerStatisticsFailures, type Executor } from '@plumbline/db';

export function failures(db: Executor, period: string | undefined) {
  return listPeerStatisticsFailures(db, period ? { period } : {});
}
