import type { LotInfo, PeriodInfo, ProcedureInfo, ValueRow } from './row-schemas.ts';

/** One lab series: a procedure, control lot, level and period. */
export type Series = { key: string; procedure: ProcedureInfo; lot: LotInfo; level: number; period: PeriodInfo };

/**
 * The accepted rows of a qc-values file in columns of plain numbers rather than one object per row, so a
 * file of a million rows costs tens of megabytes, not hundreds. Run ids are interned.
 */
export class ValuesBuffer {
  readonly series: Series[] = [];
  private readonly seriesIndex = new Map<string, number>();
  private readonly runNames = new Map<string, string>();
  readonly seriesOf: number[] = [];
  readonly measuredAt: number[] = [];
  readonly values: number[] = [];
  readonly runs: (string | null)[] = [];
  readonly comments = new Map<number, string>();

  get length(): number {
    return this.values.length;
  }

  add(row: ValueRow): void {
    const key = seriesKey(row.procedure.id, row.lot.id, row.level, row.period.period);
    let index = this.seriesIndex.get(key);
    if (index === undefined) {
      index = this.series.length;
      this.series.push({ key, procedure: row.procedure, lot: row.lot, level: row.level, period: row.period });
      this.seriesIndex.set(key, index);
    }
    const at = this.values.length;
    this.seriesOf.push(index);
    this.measuredAt.push(row.measuredAtMs);
    this.values.push(row.value);
    let run: string | null = null;
    if (row.run !== null) {
      run = this.runNames.get(row.run) ?? row.run;
      this.runNames.set(run, run);
    }
    this.runs.push(run);
    if (row.comment !== null) this.comments.set(at, row.comment);
  }
}

export const seriesKey = (procedureId: string, lotId: string, level: number, period: string) =>
  `${procedureId}|${lotId}|${level}|${period}`;
