import { fireEvent, screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { QcPlanPage } from '@plumbline/contracts';
import { recommendQcPlan } from '@plumbline/stats';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const labId = buildMe('analyst').lab!.id;
const procedureId = '0b4c7a1e-1f1d-4c55-9a53-6a1f2e3d4c5b';

function buildPage(): QcPlanPage {
  const six = recommendQcPlan(6, { simulations: 500 });
  return {
    period: '2026-03',
    settings: { minPed: 0.9, maxPfr: 0.05 },
    rows: [
      {
        procedure: { id: procedureId, code: 'GLU1' },
        analyte: 'Glucose',
        controlLot: 'CL-1001',
        level: 1,
        teaPct: 10,
        teaSource: 'Invented source for the test',
        biasPct: 1,
        cvPct: 1.5,
        sigma: 6,
        deltaSeCrit: six.deltaSeCrit,
        current: { rules: ['1-2s'], n: 2, runs: 1, ped: 0.99, pfr: 0.089 },
        recommended: six.plan,
        reached: six.reached,
        explanation: six.explanation,
      },
    ],
  };
}

describe('QC plan page', () => {
  it('when an analyst opens it, then each procedure shows sigma, plan in use, recommended plan and power curves; saving sends the plan', async () => {
    const { requests } = mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      [`GET /api/labs/${labId}/qc-plan`]: { status: 200, body: buildPage() },
      [`PUT /api/labs/${labId}/qc-plan/${procedureId}/1`]: { status: 204 },
    });
    renderApp('/lab/qc-plan', { signedInAs: 'analyst' });
    const table = await screen.findByTestId('qc-plan-table');
    const row = within(table).getByText(/GLU1/).closest('tr')!;
    expect(row.textContent).toContain('6.0');
    expect(row.textContent).toContain('1-2s, 2 controls per run');
    // A 6-sigma procedure needs one control with 1-3s (closed-form power; packages/stats tests).
    expect(row.textContent).toContain('1-3s, 1 control per run (Ped 0.91');
    fireEvent.click(within(row).getByRole('button', { name: 'Details' }));
    expect(await screen.findByTestId('power-curves')).toBeTruthy();
    fireEvent.change(screen.getByLabelText(/Rules in use/), { target: { value: '1-3s/2-2s/R-4s' } });
    fireEvent.click(screen.getByRole('button', { name: 'Save plan in use' }));
    await waitFor(() => expect(requests.some((r) => r.method === 'PUT')).toBe(true));
    expect(requests.find((r) => r.method === 'PUT')!.body).toEqual({
      rules: ['1-3s', '2-2s', 'R-4s'],
      n: 2,
      runs: 1,
    });
  });
});
