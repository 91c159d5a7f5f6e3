import { toCsv, type StudyDetail, type StudyResult } from '@plumbline/contracts';

/** One row per partition with limits, CIs, method, notes and the lab's current interval; approval and caution follow. */
export function studyResultCsv(study: StudyDetail, result: StudyResult, caution: string): string {
  const rows = result.partitions.map((p) => [
    study.analyte.code,
    p.label,
    p.n,
    p.excludedCount,
    p.method,
    p.lower?.value ?? null,
    p.lower?.ci?.[0] ?? null,
    p.lower?.ci?.[1] ?? null,
    p.upper?.value ?? null,
    p.upper?.ci?.[0] ?? null,
    p.upper?.ci?.[1] ?? null,
    result.unit,
    p.current ? `${p.current.lower}–${p.current.upper} (${p.current.source})` : null,
    p.note,
  ]);
  const advice = result.advice.map((a) => ['advice', a.advice]);
  const approval = result.approval
    ? [
        [
          'approved',
          `${result.approval.approvedAt} by ${result.approval.approvedBy}: ${result.approval.statement}`,
        ],
      ]
    : [['approved', 'not approved']];
  const table = toCsv(
    [
      'analyte',
      'partition',
      'n',
      'excluded',
      'method',
      'lower',
      'lower_ci_low',
      'lower_ci_high',
      'upper',
      'upper_ci_low',
      'upper_ci_high',
      'unit',
      'current_interval',
      'note',
    ],
    rows,
  );
  return table + toCsv(['about', 'text'], [...advice, ...approval, ['caution', caution]]);
}
