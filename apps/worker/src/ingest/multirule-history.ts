import { sql } from 'drizzle-orm';
import type { Database } from '@plumbline/db';
import type { HistoryPoint } from '@plumbline/stats';
import type { GroupResults } from './multirule-points.ts';
import type { ValuesBuffer } from './values-buffer.ts';

/**
 * Earlier values a month's multirule evaluation takes as context, per level: 10-x, the longest rule,
 * looks back ten values, so the last ten of each level also hold the last ten across levels.
 */
export const HISTORY_PER_LEVEL = 10;

/** The calendar month before a 'YYYY-MM' period. */
export function previousPeriod(period: string): string {
  const year = Number(period.slice(0, 4));
  const month = Number(period.slice(5, 7));
  return month === 1 ? `${year - 1}-12` : `${year}-${String(month - 1).padStart(2, '0')}`;
}

/** The last HISTORY_PER_LEVEL points of each level, keeping their order (oldest first). */
export function lastPerLevel(points: readonly HistoryPoint[]): HistoryPoint[] {
  const kept = new Map<number, number>();
  const keep = new Array<boolean>(points.length).fill(false);
  for (let i = points.length - 1; i >= 0; i--) {
    const count = kept.get(points[i].level) ?? 0;
    if (count < HISTORY_PER_LEVEL) {
      keep[i] = true;
      kept.set(points[i].level, count + 1);
    }
  }
  return points.filter((_, i) => keep[i]);
}

/**
 * A group's evaluated values as history for the next month's group of the same procedure and lot:
 * values with a z (levels with a target), in time order, the last HISTORY_PER_LEVEL of each level.
 */
export function historyOfGroup(
  buffer: ValuesBuffer,
  rows: ArrayLike<number>,
  result: GroupResults,
): HistoryPoint[] {
  const points: HistoryPoint[] = [];
  for (let t = 0; t < result.timeOrder.length; t++) {
    const k = result.timeOrder[t];
    if (!Number.isFinite(result.z[k])) continue;
    points.push({ level: buffer.series[buffer.seriesOf(rows[k])].level, z: result.z[k] });
  }
  return lastPerLevel(points);
}

/**
 * The stored values of the month before each group's period (same procedure and lot, every level) that
 * carry a z, as history keyed `procedureId|controlLotId|period` of the group they precede. Their z is
 * the one stored when they were evaluated, against the target of their own month.
 */
export async function storedHistory(
  tx: Database,
  groups: readonly { procedureId: string; controlLotId: string; period: string }[],
): Promise<Map<string, HistoryPoint[]>> {
  const history = new Map<string, HistoryPoint[]>();
  if (groups.length === 0) return history;
  const result = await tx.execute<{
    procedureId: string;
    controlLotId: string;
    period: string;
    level: number;
    z: number;
  }>(sql`
    select procedure_id as "procedureId", control_lot_id as "controlLotId", period, level, z
      from (select v.procedure_id, v.control_lot_id, v.period, v.level, v.z, v.measured_at, v.id,
                   row_number() over (partition by v.procedure_id, v.control_lot_id, v.period, v.level
                                      order by v.measured_at desc, v.id desc) as back
              from qc_values v
              join unnest(${sql.param(groups.map((g) => g.procedureId))}::uuid[],
                          ${sql.param(groups.map((g) => g.controlLotId))}::uuid[],
                          ${sql.param(groups.map((g) => previousPeriod(g.period)))}::text[])
                   as wanted(procedure_id, control_lot_id, period)
                on wanted.procedure_id = v.procedure_id and wanted.control_lot_id = v.control_lot_id
               and wanted.period = v.period
             where v.z is not null) as recent
     where back <= ${HISTORY_PER_LEVEL}
     order by "procedureId", "controlLotId", measured_at, level, id`);
  const nextPeriod = new Map(
    groups.map((g) => [`${g.procedureId}|${g.controlLotId}|${previousPeriod(g.period)}`, g.period]),
  );
  for (const row of result.rows) {
    const period = nextPeriod.get(`${row.procedureId}|${row.controlLotId}|${row.period}`);
    if (period === undefined) continue;
    const key = `${row.procedureId}|${row.controlLotId}|${period}`;
    const list = history.get(key);
    const point = { level: row.level, z: row.z };
    if (list) list.push(point);
    else history.set(key, [point]);
  }
  return history;
}
