import { describe, expect, it } from 'vitest';
import { canonicalColumns } from '@plumbline/contracts';
import { buildSummaryPreview } from '../../../testing/upload-data.ts';
import { mappingIssues, samplePeriods, sampleValue, toColumnMapping } from './column-mapping.ts';

const summaryColumns = canonicalColumns['qc-summary'].map((c) => ({ ...c }));

describe('column mapping helpers', () => {
  it('when every required column has its own file column, then there is no issue', () => {
    expect(mappingIssues(summaryColumns, buildSummaryPreview().suggestedMapping)).toEqual([]);
  });

  it('when a required column is missing and another file column is used twice, then both are named', () => {
    const draft = { ...buildSummaryPreview().suggestedMapping, unit: null, sd: 'Average' };
    expect(mappingIssues(summaryColumns, draft)).toEqual([
      { column: 'sd', message: '“Average” is already chosen for mean.' },
      { column: 'unit', message: 'Choose the column of your file that holds this.' },
    ]);
  });

  it('when an optional column is left out, then it is not an issue and it is not sent', () => {
    const columns = canonicalColumns['qc-values'].map((c) => ({ ...c }));
    const draft = {
      measured_at: 'When',
      procedure: 'Test',
      control_lot: 'Lot',
      level: 'Lvl',
      value: 'Result',
      unit: 'Units',
      run: null,
      comment: null,
    };
    expect(mappingIssues(columns, draft)).toEqual([]);
    expect(toColumnMapping(draft)).toEqual({
      measured_at: 'When',
      procedure: 'Test',
      control_lot: 'Lot',
      level: 'Lvl',
      value: 'Result',
      unit: 'Units',
    });
  });

  it('when a header is chosen, then its first value in the sample rows is shown', () => {
    const preview = buildSummaryPreview();
    expect(sampleValue(preview, 'Average')).toBe('4,12');
    expect(sampleValue(preview, null)).toBeNull();
    expect(sampleValue(preview, 'Not a header')).toBeNull();
  });

  it('when the sample rows name months, then the periods are read from the period or timestamp column', () => {
    const summary = buildSummaryPreview({
      rows: [
        ['2026-11', 'K1', 'PGC-26187', '1', '31', '4,12', '0,05', 'mmol/L'],
        ['2026-10', 'K1', 'PGC-26187', '1', '30', '4,10', '0,05', 'mmol/L'],
        ['not a month', 'K1', 'PGC-26187', '2', '30', '6,4', '0,08', 'mmol/L'],
      ],
    });
    expect(samplePeriods('qc-summary', summary, summary.suggestedMapping)).toEqual(['2026-10', '2026-11']);

    const values = buildSummaryPreview({
      kind: 'qc-values',
      headers: ['When', 'Result'],
      rows: [
        ['2026-12-03T08:15:00Z', '4.1'],
        ['2026-12-04', '4.2'],
      ],
    });
    expect(samplePeriods('qc-values', values, { measured_at: 'When' })).toEqual(['2026-12']);
    expect(samplePeriods('qc-values', values, { measured_at: null })).toEqual([]);
  });
});
