import type { LotInfo, PeriodInfo, ProcedureInfo, ValueRow } from './row-schemas.ts';

/** One lab series: a procedure, control lot, level and period. */
export type Series = {
  key: string;
  procedure: ProcedureInfo;
  lot: LotInfo;
  level: number;
  period: PeriodInfo;
};

/** A typed array that grows by doubling, so a column of a million numbers is one block of memory. */
class Column<T extends Float64Array | Int32Array> {
  length = 0;
  constructor(private data: T) {}

  push(value: number): void {
    if (this.length === this.data.length) {
      const bigger = new (this.data.constructor as new (n: number) => T)(this.data.length * 2);
      bigger.set(this.data);
      this.data = bigger;
    }
    this.data[this.length++] = value;
  }

  at(index: number): number {
    return this.data[index];
  }
}

/**
 * The accepted rows of a qc-values file in typed columns rather than one object per row, so a file of a
 * million rows costs about 25 MB. Run ids and comments are kept once each.
 */
export class ValuesBuffer {
  readonly series: Series[] = [];
  /** Procedure id → indices into `series` of its series (a handful: levels × lots × periods). */
  private readonly seriesOfProcedure = new Map<string, number[]>();
  private readonly runIndex = new Map<string, number>();
  private readonly runNames: string[] = [];
  private readonly seriesColumn = new Column(new Int32Array(1024));
  private readonly measuredAtColumn = new Column(new Float64Array(1024));
  private readonly valueColumn = new Column(new Float64Array(1024));
  private readonly runColumn = new Column(new Int32Array(1024));
  readonly comments = new Map<number, string>();

  get length(): number {
    return this.valueColumn.length;
  }

  add(row: ValueRow): void {
    const index = this.seriesIndexOf(row);
    const at = this.length;
    this.seriesColumn.push(index);
    this.measuredAtColumn.push(row.measuredAtMs);
    this.valueColumn.push(row.value);
    let run = -1;
    if (row.run !== null) {
      run = this.runIndex.get(row.run) ?? -1;
      if (run === -1) {
        run = this.runNames.length;
        this.runNames.push(row.run);
        this.runIndex.set(row.run, run);
      }
    }
    this.runColumn.push(run);
    if (row.comment !== null) this.comments.set(at, row.comment);
  }

  /** The series of the row's procedure, lot, level and period, added when new. */
  private seriesIndexOf(row: ValueRow): number {
    let candidates = this.seriesOfProcedure.get(row.procedure.id);
    if (candidates === undefined) {
      candidates = [];
      this.seriesOfProcedure.set(row.procedure.id, candidates);
    }
    for (const index of candidates) {
      const s = this.series[index];
      if (s.level === row.level && s.lot.id === row.lot.id && s.period.period === row.period.period)
        return index;
    }
    const index = this.series.length;
    const key = seriesKey(row.procedure.id, row.lot.id, row.level, row.period.period);
    this.series.push({ key, procedure: row.procedure, lot: row.lot, level: row.level, period: row.period });
    candidates.push(index);
    return index;
  }

  /** Index into `series` of row i. */
  seriesOf(i: number): number {
    return this.seriesColumn.at(i);
  }

  /** Epoch milliseconds of row i. */
  measuredAt(i: number): number {
    return this.measuredAtColumn.at(i);
  }

  /** Value of row i in the analyte's unit. */
  value(i: number): number {
    return this.valueColumn.at(i);
  }

  /** Run id of row i as written, or null. */
  run(i: number): string | null {
    const run = this.runColumn.at(i);
    return run === -1 ? null : this.runNames[run];
  }

  /** Number of row i's run id among the distinct run ids (0, 1, …), or -1 when the row has none. */
  runNumber(i: number): number {
    return this.runColumn.at(i);
  }

  /** The run id with that number. */
  runName(runNumber: number): string {
    return this.runNames[runNumber];
  }

  /** The number of a run id, or -1 when no row has it. */
  numberOfRun(name: string): number {
    return this.runIndex.get(name) ?? -1;
  }
}

export const seriesKey = (procedureId: string, lotId: string, level: number, period: string) =>
  `${procedureId}|${lotId}|${level}|${period}`;
