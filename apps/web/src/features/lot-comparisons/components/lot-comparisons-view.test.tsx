import { screen, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { lotComparisonsSchema, type LotComparisons } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';

// Invented figures: the shape of the API answer, not a computation (the API test checks the figures).
const analyteId = '2b3c4d5e-0000-4000-8000-000000000001';
const lotA = '2b3c4d5e-0000-4000-8000-000000000011';
const lotB = '2b3c4d5e-0000-4000-8000-000000000012';
const glucose = {
  id: analyteId,
  code: 'GLU',
  name: 'Glucose',
  loinc: null,
  unit: 'mmol/L',
  conventionalUnit: null,
  molarMass: null,
  decimals: 2,
  teaPct: null,
  teaAbsolute: null,
  teaSource: null,
  teaDate: null,
  plausibleLow: null,
  plausibleHigh: null,
  plausibilitySource: null,
  allowsNegative: false,
  retiredAt: null,
  retired: false,
};
const difference = (d: number, low: number, high: number) => ({
  difference: d,
  low,
  high,
  differencePct: d * 20,
  lowPct: low * 20,
  highPct: high * 20,
  dof: 5,
});
const answer: LotComparisons = lotComparisonsSchema.parse({
  analyteId,
  analyteCode: 'GLU',
  analyteName: 'Glucose',
  unit: 'mmol/L',
  period: '2026-03',
  previousPeriod: '2026-02',
  comparisons: [
    {
      level: 1,
      fromLot: { controlLotId: lotA, lotNumber: 'QC-1001', period: '2026-02', labs: 7, mean: 5.5, sd: 0.2 },
      toLot: { controlLotId: lotB, lotNumber: 'QC-2002', period: '2026-03', labs: 6, mean: 5.7, sd: 0.21 },
      pairedLabs: 6,
      labDifferences: [0.18, 0.19, 0.2, 0.21, 0.22, 0.23],
      labsHigher: 6,
      labsLower: 0,
      reagentLotChanges: 0,
      paired: difference(0.205, 0.186, 0.224),
      welch: difference(0.2, -0.05, 0.45),
      verdict: 'lot-effect',
      explanation:
        'The new lot reads higher in 6 of 6 labs that changed lot: a lot effect, not a lab problem.',
    },
  ],
  caution: 'Each laboratory director decides.',
});

describe('lot comparisons page', () => {
  it('when a coordinator opens it, then the level shows both lots, the paired shift with its interval, the verdict and the chart', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('coordinator') },
      'GET /api/catalogue/analytes': { status: 200, body: { total: 1, items: [glucose] } },
      'GET /api/periods': {
        status: 200,
        body: [
          { period: '2026-02', state: 'published', deadline: '2026-03-10T22:59:00.000Z' },
          { period: '2026-03', state: 'open', deadline: '2026-04-10T22:59:00.000Z' },
        ],
      },
      'GET /api/lot-comparisons': { status: 200, body: answer },
    });
    renderApp('/network/lot-comparisons', { signedInAs: 'coordinator' });

    const level = await screen.findByRole('region', { name: 'Level 1' });
    expect(within(level).getByText(/QC-1001 → QC-2002/)).toBeTruthy();
    expect(within(level).getByText('Lot effect')).toBeTruthy();
    expect(within(level).getByText(/0\.205 mmol\/L, 95 % CI 0\.186 to 0\.224/)).toBeTruthy();
    expect(within(level).getByText(/reads higher in 6 of 6 labs/)).toBeTruthy();
    const chart = within(level).getByTestId('lot-chart-1');
    expect(chart.querySelectorAll('circle').length).toBe(6 + 1);
    expect(within(level).getByTestId('lot-interval-1')).toBeTruthy();

    const call = api.requests.find((r) => r.path === '/api/lot-comparisons')!;
    // The latest month is chosen first.
    expect(call.query.get('period')).toBe('2026-03');
    expect(call.query.get('analyteId')).toBe(analyteId);
  });
});
