import type { Database } from '@plumbline/db';
import type { DetectedShiftItem, ProcedureShifts } from '@plumbline/contracts';
import { detectShifts } from '@plumbline/stats';
import type { Principal } from '../../auth/principal.ts';
import { notFound } from '../../errors/app-error.ts';
import { UUID, visibleLab } from '../lab-review/lab-scope.ts';
import { buildDrilldown } from '../report-drilldown/report-drilldown.service.ts';
import { findControlLot } from '../report-drilldown/report-drilldown.repository.ts';
import * as repo from './procedure-events.repository.ts';
import { toEvent } from './procedure-events.service.ts';

/** Days before a shift's first month in which recorded events are looked for (a setting of the method). */
export const EVENT_WINDOW_DAYS = 92;
/** How many of the nearest earlier events a shift lists. */
const EVENTS_PER_SHIFT = 3;

/**
 * Detector settings for a monthly SDI series: the CUSUM defaults, plus a Shewhart limit of 3 SDI so a
 * single month's jump is flagged at once (monthly series are short; common practice, no single source).
 */
export const MONTHLY_SHIFT_OPTIONS = { k: 0.5, h: 5, shewhart: 3 } as const;

const METHOD =
  'Combined Shewhart-CUSUM on the monthly SDI (in-control mean 0, SD 1; CUSUM k = 0.5, h = 5; one month beyond ±3 SDI also signals); the shift starts at the first month of the CUSUM run that signalled.';

function lastDayOf(period: string): string {
  const [year, month] = period.split('-').map(Number);
  return new Date(Date.UTC(year, month, 0)).toISOString().slice(0, 10);
}
function daysBefore(period: string, days: number): string {
  const first = new Date(`${period}-01T00:00:00Z`);
  return new Date(first.getTime() - days * 86_400_000).toISOString().slice(0, 10);
}
const mean = (xs: number[]) => xs.reduce((a, b) => a + b, 0) / xs.length;

/**
 * Shifts of a procedure's monthly SDI series (per control lot and level, the drill-down's trend), each
 * with the events the lab recorded for the procedure from `EVENT_WINDOW_DAYS` before the shift's first
 * month to its end, newest first.
 */
export async function procedureShifts(
  db: Database,
  principal: Principal,
  labId: string,
  procedureId: string,
  only: { controlLotId?: string; level?: number } = {},
): Promise<ProcedureShifts> {
  await visibleLab(db, principal, labId);
  const procedure = UUID.test(procedureId) ? await repo.findProcedure(db, labId, procedureId) : null;
  if (!procedure) throw notFound('Procedure');
  const events = await repo.listEvents(db, labId, { procedureId: procedure.id });

  const series: ProcedureShifts['series'] = [];
  const shifts: DetectedShiftItem[] = [];
  for (const key of await repo.seriesKeys(db, procedure.id)) {
    if (!key.latest) continue;
    if (only.controlLotId !== undefined && key.controlLotId !== only.controlLotId) continue;
    if (only.level !== undefined && key.level !== only.level) continue;
    const lot = await findControlLot(db, key.controlLotId);
    if (!lot) continue;
    const drilldown = await buildDrilldown(
      db,
      principal,
      labId,
      { procedureId: procedure.id, controlLotId: key.controlLotId, level: key.level },
      { period: key.latest, target: 'lab' },
    );
    const points = drilldown.trend.flatMap((p) =>
      p.sdi === null ? [] : [{ period: p.period, sdi: p.sdi, biasPct: p.biasPct }],
    );
    series.push({ controlLotId: lot.id, controlLot: lot.lotNumber, level: key.level, points });
    for (const shift of detectShifts(
      points.map((p) => p.sdi),
      MONTHLY_SHIFT_OPTIONS,
    )) {
      const before = points.slice(0, shift.index).flatMap((p) => (p.biasPct === null ? [] : [p.biasPct]));
      const after = points
        .slice(shift.index, shift.signalIndex + 1)
        .flatMap((p) => (p.biasPct === null ? [] : [p.biasPct]));
      const period = points[shift.index].period;
      const from = daysBefore(period, EVENT_WINDOW_DAYS);
      const to = lastDayOf(period);
      shifts.push({
        controlLotId: lot.id,
        controlLot: lot.lotNumber,
        level: key.level,
        period,
        signalPeriod: points[shift.signalIndex].period,
        sizeSdi: shift.size,
        // Bias % moves with the SDI; before the first month there is no baseline, so it is 0 %.
        sizePct: after.length > 0 ? mean(after) - (before.length > 0 ? mean(before) : 0) : null,
        direction: shift.direction,
        confidence: shift.confidence,
        events: events
          .filter((e) => e.occurredOn >= from && e.occurredOn <= to)
          .slice(0, EVENTS_PER_SHIFT)
          .map(toEvent),
      });
    }
  }
  return { procedureId: procedure.id, method: METHOD, eventWindowDays: EVENT_WINDOW_DAYS, series, shifts };
}

/**
 * Shifts of every procedure of the lab whose signal came in `period`. A procedure whose shifts cannot
 * be computed is left out (its drill-down says why), so one bad series never hides the others.
 */
export async function shiftsSignalledIn(
  db: Database,
  principal: Principal,
  labId: string,
  period: string,
): Promise<Array<{ procedureCode: string; shift: DetectedShiftItem }>> {
  const found: Array<{ procedureCode: string; shift: DetectedShiftItem }> = [];
  for (const procedure of await repo.proceduresWithData(db, labId)) {
    let result: ProcedureShifts;
    try {
      result = await procedureShifts(db, principal, labId, procedure.id);
    } catch {
      continue;
    }
    for (const shift of result.shifts) {
      if (shift.signalPeriod === period) found.push({ procedureCode: procedure.code, shift });
    }
  }
  return found;
}
