import { describe, expect, it } from 'vitest';
import type { PeerReportRow } from '@plumbline/contracts';
import { buildPeerReport } from '../../../testing/upload-data.ts';
import { analytesOf, filterRows, isFlagged, signed, worstFlag } from './report-rows.ts';

function rowWith(flags: PeerReportRow['flags'], analyte = { code: 'K', name: 'Potassium' }): PeerReportRow {
  const row = buildPeerReport('2026-11', [{ code: 'X1', level: 1, mean: 4 }]).rows[0];
  return { ...row, analyte: { ...row.analyte, ...analyte }, flags };
}

const fine = rowWith([{ kind: 'sdi', severity: 'fine', message: 'SDI within 1' }]);
const warning = rowWith([
  { kind: 'sdi', severity: 'acceptable', message: 'SDI within 2' },
  { kind: 'cvr', severity: 'warning', message: 'CVR above 1.5' },
]);
const action = rowWith([{ kind: 'sdi', severity: 'action', message: 'SDI beyond 3' }], {
  code: 'GLU',
  name: 'Glucose',
});
const unflagged = rowWith([], { code: 'GLU', name: 'Glucose' });

describe('report rows', () => {
  it('when a row has several flags, then its worst one counts', () => {
    expect(worstFlag(warning)).toBe('warning');
    expect(worstFlag(unflagged)).toBeNull();
    expect([fine, warning, action, unflagged].map(isFlagged)).toEqual([false, true, true, false]);
  });

  it('when filtering to flagged rows, then only warning and action rows remain', () => {
    expect(
      filterRows([fine, warning, action, unflagged], { flaggedOnly: true, analyte: '', severity: '' }),
    ).toEqual([warning, action]);
  });

  it('when filtering to flagged rows, then a row that cannot be computed stays in view', () => {
    const notComputable = { ...unflagged, notComputable: { reason: 'The peer SD is 0.' } };
    expect(
      filterRows([fine, notComputable, unflagged], { flaggedOnly: true, analyte: '', severity: '' }),
    ).toEqual([notComputable]);
  });

  it('when filtering by analyte and severity, then both apply; a row without flags counts as fine', () => {
    const rows = [fine, warning, action, unflagged];
    expect(filterRows(rows, { flaggedOnly: false, analyte: 'GLU', severity: '' })).toEqual([
      action,
      unflagged,
    ]);
    expect(filterRows(rows, { flaggedOnly: false, analyte: '', severity: 'fine' })).toEqual([
      fine,
      unflagged,
    ]);
    expect(filterRows(rows, { flaggedOnly: false, analyte: 'K', severity: 'action' })).toEqual([]);
  });

  it('when listing analytes, then each appears once, by name', () => {
    expect(analytesOf([fine, action, warning, unflagged])).toEqual([
      { code: 'GLU', name: 'Glucose' },
      { code: 'K', name: 'Potassium' },
    ]);
  });

  it('when a figure is signed, then it carries + or a true minus sign, and zero none', () => {
    expect([signed(1.234), signed(-0.4), signed(0.001), signed(null)]).toEqual([
      '+1.23',
      '\u22120.40',
      '0.00',
      '—',
    ]);
  });
});
