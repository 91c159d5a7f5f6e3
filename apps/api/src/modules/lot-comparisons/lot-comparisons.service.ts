import {
  lotComparisonsQuerySchema,
  type LotComparison,
  type LotComparisons,
  type LotDifference,
  type LotVerdict,
} from '@plumbline/contracts';
import type { Database } from '@plumbline/db';
import { pairedMeanDifference, welchMeanDifference, type MeanDifference } from '@plumbline/stats';
import { notFound } from '../../errors/app-error.ts';
import { parseInput } from '../../http/validate.ts';
import * as repo from './lot-comparisons.repository.ts';

const CAUTION =
  'A lot effect seen here informs the coordinator and the labs; each laboratory director decides what it means for their results under local regulation and accreditation.';

type Summary = Awaited<ReturnType<typeof repo.analyteSummaries>>[number];

/** The month before a YYYY-MM period. */
export function previousPeriodOf(period: string): string {
  const [year, month] = period.split('-').map(Number) as [number, number];
  return month === 1 ? `${year - 1}-12` : `${year}-${String(month - 1).padStart(2, '0')}`;
}

/** The month after a YYYY-MM period. */
function nextPeriodOf(period: string): string {
  const [year, month] = period.split('-').map(Number) as [number, number];
  return month === 12 ? `${year + 1}-01` : `${year}-${String(month + 1).padStart(2, '0')}`;
}

function mean(values: number[]): number {
  return values.reduce((sum, v) => sum + v, 0) / values.length;
}

function sampleSd(values: number[]): number | null {
  if (values.length < 2) return null;
  const m = mean(values);
  return Math.sqrt(values.reduce((sum, v) => sum + (v - m) * (v - m), 0) / (values.length - 1));
}

function withPct(d: MeanDifference, reference: number): LotDifference {
  const pct = (x: number) => (reference === 0 ? null : (100 * x) / reference);
  return {
    difference: d.difference,
    low: d.low,
    high: d.high,
    differencePct: pct(d.difference),
    lowPct: pct(d.low),
    highPct: pct(d.high),
    dof: d.dof,
  };
}

function verdictOf(
  paired: LotDifference | null,
  welch: LotDifference | null,
  labsHigher: number,
  labsLower: number,
  pairedLabs: number,
): { verdict: LotVerdict; explanation: string } {
  const basis = paired ?? welch;
  if (!basis) {
    return {
      verdict: 'too-few-labs',
      explanation: 'Too few labs reported both lots to tell a lot effect from a lab effect.',
    };
  }
  const how = paired ? 'the same labs measured on both lots' : 'the two lots’ peer means (different labs)';
  if (basis.low > 0 || basis.high < 0) {
    const direction = basis.low > 0 ? 'higher' : 'lower';
    const most = basis.low > 0 ? labsHigher : labsLower;
    return {
      verdict: 'lot-effect',
      explanation:
        `The new lot reads ${direction} in ${most} of ${pairedLabs} labs that changed lot, and the 95 % interval ` +
        `of the shift (from ${how}) excludes zero: a lot effect, not a lab problem. Set the new lot’s targets from its own data.`,
    };
  }
  return {
    verdict: 'no-common-shift',
    explanation:
      `No shift common to the labs: the 95 % interval of the shift (from ${how}) includes zero. ` +
      'A lab whose values moved at the lot change should look at its own procedure.',
  };
}

/** Lot-to-lot comparisons of an analyte: each control lot change between the previous month and this one. */
export async function lotComparisons(db: Database, rawQuery: unknown): Promise<LotComparisons> {
  const query = parseInput(lotComparisonsQuerySchema, rawQuery, 'query');
  const analyte = await repo.findAnalyte(db, query.analyteId);
  if (!analyte) throw notFound('Analyte');
  const previousPeriod = previousPeriodOf(query.period);
  const [rows, reagentChanged] = await Promise.all([
    repo.analyteSummaries(db, analyte.id, [previousPeriod, query.period]),
    repo.reagentLotChangeProcedures(
      db,
      analyte.id,
      `${previousPeriod}-01`,
      `${nextPeriodOf(query.period)}-01`,
    ),
  ]);
  return {
    analyteId: analyte.id,
    analyteCode: analyte.code,
    analyteName: analyte.name,
    unit: analyte.unit,
    period: query.period,
    previousPeriod,
    comparisons: compareLots(rows, previousPeriod, query.period, reagentChanged),
    caution: CAUTION,
  };
}

/**
 * Pairs each procedure that reported exactly one lot in the previous month and another lot (not reported
 * before) this month, per level; every pair of lots with at least one such procedure is compared.
 */
export function compareLots(
  rows: Summary[],
  previousPeriod: string,
  period: string,
  reagentChanged: ReadonlySet<string>,
): LotComparison[] {
  const before = rows.filter((r) => r.period === previousPeriod);
  const after = rows.filter((r) => r.period === period);
  const beforeOf = new Map<string, Summary[]>();
  for (const r of before) {
    const key = `${r.procedureId}|${r.level}`;
    beforeOf.set(key, [...(beforeOf.get(key) ?? []), r]);
  }
  const pairs = new Map<string, { from: Summary; to: Summary; differences: number[]; reagent: number }>();
  for (const to of after) {
    const previous = beforeOf.get(`${to.procedureId}|${to.level}`) ?? [];
    if (previous.length !== 1) continue;
    const from = previous[0]!;
    if (from.controlLotId === to.controlLotId) continue;
    const key = `${to.level}|${from.controlLotId}|${to.controlLotId}`;
    const pair = pairs.get(key) ?? { from, to, differences: [], reagent: 0 };
    pair.differences.push(to.mean - from.mean);
    if (reagentChanged.has(to.procedureId)) pair.reagent += 1;
    pairs.set(key, pair);
  }

  const comparisons: LotComparison[] = [];
  for (const { from, to, differences, reagent } of pairs.values()) {
    const fromMeans = before
      .filter((r) => r.level === from.level && r.controlLotId === from.controlLotId)
      .map((r) => r.mean);
    const toMeans = after
      .filter((r) => r.level === to.level && r.controlLotId === to.controlLotId)
      .map((r) => r.mean);
    const fromPeer = { mean: mean(fromMeans), sd: sampleSd(fromMeans), labs: fromMeans.length };
    const toPeer = { mean: mean(toMeans), sd: sampleSd(toMeans), labs: toMeans.length };
    const paired = differences.length >= 2 ? withPct(pairedMeanDifference(differences), fromPeer.mean) : null;
    let welch: LotDifference | null = null;
    if (fromPeer.sd !== null && toPeer.sd !== null && (fromPeer.sd > 0 || toPeer.sd > 0)) {
      welch = withPct(
        welchMeanDifference(
          { mean: fromPeer.mean, sd: fromPeer.sd, labs: fromPeer.labs },
          { mean: toPeer.mean, sd: toPeer.sd, labs: toPeer.labs },
        ),
        fromPeer.mean,
      );
    }
    const labsHigher = differences.filter((d) => d > 0).length;
    const labsLower = differences.filter((d) => d < 0).length;
    const verdict = verdictOf(paired, welch, labsHigher, labsLower, differences.length);
    // A reagent lot changed in the same months is the other explanation of a common shift.
    const reagentNote =
      reagent > 0
        ? ` ${reagent} of ${differences.length} labs also recorded a reagent-lot change in these two months; their shift may come from the reagent.`
        : '';
    comparisons.push({
      level: to.level,
      fromLot: {
        controlLotId: from.controlLotId,
        lotNumber: from.lotNumber,
        period: previousPeriod,
        ...fromPeer,
      },
      toLot: { controlLotId: to.controlLotId, lotNumber: to.lotNumber, period, ...toPeer },
      pairedLabs: differences.length,
      labDifferences: [...differences].sort((a, b) => a - b),
      labsHigher,
      labsLower,
      paired,
      welch,
      reagentLotChanges: reagent,
      verdict: verdict.verdict,
      explanation: verdict.explanation + reagentNote,
    });
  }
  return comparisons.sort((a, b) => a.level - b.level || b.pairedLabs - a.pairedLabs);
}
