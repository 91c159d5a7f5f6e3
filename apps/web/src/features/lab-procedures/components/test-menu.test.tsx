import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { testMenuItemSchema, type TestMenuItem } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import { testLabId } from '../../../testing/lab-workspace-data.ts';

const ref = (id: string, code: string, name: string) => ({ id, code, name });
const potassium = {
  ...ref('1a2b3c4d-0000-4000-8000-000000000001', 'K', 'Potassium'),
  loinc: '2823-3',
  unit: 'mmol/L',
  conventionalUnit: null,
};
const analyzer = ref('1a2b3c4d-0000-4000-8000-000000000011', 'QX4', 'Invented analyser QX-400');
const ise = ref('1a2b3c4d-0000-4000-8000-000000000021', 'ISE-IND', 'Ion-selective electrode, indirect');
const reagent = ref('1a2b3c4d-0000-4000-8000-000000000031', 'QX-SYS', 'Invented system reagents');

function item(overrides: Partial<TestMenuItem> = {}): TestMenuItem {
  return testMenuItemSchema.parse({
    id: '2b3c4d5e-0000-4000-8000-000000000001',
    code: 'K-CHEM2',
    analyte: potassium,
    instrumentModel: analyzer,
    method: ise,
    reagent,
    unit: 'mmol/L',
    createdAt: '2026-06-01T08:00:00.000Z',
    retiredAt: null,
    ...overrides,
  });
}

const page = <T,>(items: T[]) => ({ status: 200, body: { total: items.length, items } });
const retirable = { retiredAt: null, retired: false };

describe('procedures page', () => {
  it('when the supervisor registers a procedure, then its analyte, instrument, method, reagent, unit and code are sent', async () => {
    const menu = [item()];
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('supervisor') },
      [`GET /api/labs/${testLabId}/test-menu`]: () => ({ status: 200, body: menu }),
      'GET /api/catalogue/analytes': page([
        {
          ...potassium,
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
          ...retirable,
        },
        {
          id: '1a2b3c4d-0000-4000-8000-000000000002',
          code: 'GLU',
          name: 'Glucose',
          loinc: '2345-7',
          unit: 'mmol/L',
          conventionalUnit: 'mg/dL',
          molarMass: 180.16,
          decimals: 1,
          teaPct: null,
          teaAbsolute: null,
          teaSource: null,
          teaDate: null,
          plausibleLow: null,
          plausibleHigh: null,
          plausibilitySource: null,
          allowsNegative: false,
          ...retirable,
        },
      ]),
      'GET /api/catalogue/instrument-models': page([{ ...analyzer, manufacturer: null, ...retirable }]),
      'GET /api/catalogue/methods': page([
        {
          id: '1a2b3c4d-0000-4000-8000-000000000022',
          code: 'GLU-HK',
          name: 'Hexokinase',
          principle: null,
          ...retirable,
        },
      ]),
      'GET /api/catalogue/reagents': page([{ ...reagent, manufacturer: null, ...retirable }]),
      [`POST /api/labs/${testLabId}/procedures`]: () => {
        const created = item({
          id: '2b3c4d5e-0000-4000-8000-000000000002',
          code: 'GLU-CHEM2',
          unit: 'mg/dL',
        });
        menu.push(created);
        return { status: 201, body: created };
      },
    });
    const { user } = renderApp('/lab/procedures', { signedInAs: 'supervisor' });
    await screen.findByText('K-CHEM2');

    await user.click(screen.getByRole('button', { name: 'Register a procedure' }));
    const dialog = await screen.findByRole('dialog', { name: 'Register a measurement procedure' });
    await waitFor(() => expect(within(dialog).getAllByRole('option', { name: /Glucose/ })).toHaveLength(1));
    await user.selectOptions(within(dialog).getByLabelText('Analyte'), 'Glucose (GLU, LOINC 2345-7)');
    // Choosing the analyte proposes its unit; the lab reports in the conventional one instead.
    expect((within(dialog).getByLabelText('Unit the lab reports in') as HTMLInputElement).value).toBe(
      'mmol/L',
    );
    await user.clear(within(dialog).getByLabelText('Unit the lab reports in'));
    await user.type(within(dialog).getByLabelText('Unit the lab reports in'), 'mg/dL');
    await user.selectOptions(within(dialog).getByLabelText('Instrument model'), analyzer.id);
    await user.selectOptions(within(dialog).getByLabelText('Method'), '1a2b3c4d-0000-4000-8000-000000000022');
    await user.selectOptions(within(dialog).getByLabelText('Reagent'), reagent.id);
    await user.type(within(dialog).getByLabelText('Short code'), 'GLU-CHEM2');
    await user.click(within(dialog).getByRole('button', { name: 'Register procedure' }));

    await screen.findByText('GLU-CHEM2');
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({
      code: 'GLU-CHEM2',
      analyteId: '1a2b3c4d-0000-4000-8000-000000000002',
      instrumentModelId: analyzer.id,
      methodId: '1a2b3c4d-0000-4000-8000-000000000022',
      reagentId: reagent.id,
      unit: 'mg/dL',
    });
  });

  it('when a required choice is missing, then the form says which and sends nothing', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('supervisor') },
      [`GET /api/labs/${testLabId}/test-menu`]: { status: 200, body: [] },
      'GET /api/catalogue/analytes': page([]),
      'GET /api/catalogue/instrument-models': page([]),
      'GET /api/catalogue/methods': page([]),
      'GET /api/catalogue/reagents': page([]),
    });
    const { user } = renderApp('/lab/procedures', { signedInAs: 'supervisor' });
    await screen.findByText(/No measurement procedure is registered yet/);
    await user.click(screen.getByRole('button', { name: 'Register a procedure' }));
    const dialog = await screen.findByRole('dialog', { name: 'Register a measurement procedure' });
    await user.click(within(dialog).getByRole('button', { name: 'Register procedure' }));
    expect(await within(dialog).findByText('Choose the analyte')).toBeTruthy();
    expect(within(dialog).getByText('Choose the reagent')).toBeTruthy();
    expect(api.requests.some((r) => r.method === 'POST')).toBe(false);
  });

  it('when the supervisor retires a procedure with a reason, then the reason is sent and it leaves the list', async () => {
    let retired = false;
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('supervisor') },
      [`GET /api/labs/${testLabId}/test-menu`]: () => ({
        status: 200,
        body: [item(retired ? { retiredAt: '2026-12-02T09:00:00.000Z' } : {})],
      }),
      [`POST /api/labs/${testLabId}/procedures/2b3c4d5e-0000-4000-8000-000000000001/retire`]: () => {
        retired = true;
        return { status: 200, body: item({ retiredAt: '2026-12-02T09:00:00.000Z' }) };
      },
    });
    const { user } = renderApp('/lab/procedures', { signedInAs: 'supervisor' });
    await user.click(await screen.findByRole('button', { name: 'Retire K-CHEM2' }));
    const dialog = await screen.findByRole('dialog', { name: 'Retire K-CHEM2?' });
    await user.type(within(dialog).getByRole('textbox'), 'Analyser replaced');
    await user.click(within(dialog).getByRole('button', { name: 'Retire procedure' }));

    await waitFor(() => expect(screen.queryByText('K-CHEM2')).toBeNull());
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({ reason: 'Analyser replaced' });
    await user.click(screen.getByLabelText('Show retired procedures (1)'));
    expect(await screen.findByRole('button', { name: 'Restore K-CHEM2' })).toBeTruthy();
  });
});
