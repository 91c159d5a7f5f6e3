import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { buildAnalyte, buildControlLot, buildImportResult } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const me = { 'GET /api/me': { status: 200, body: buildMe('coordinator') } };

describe('catalogue page', () => {
  it('when the analytes list loads, then each entry is a row with its code, LOINC, unit and TEa', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/analytes': {
        status: 200,
        body: {
          total: 2,
          items: [
            buildAnalyte(),
            buildAnalyte({
              id: '9a1b2c3d-4e5f-4a6b-8c7d-0e1f2a3b4c02',
              code: 'NA',
              name: 'Sodium',
              loinc: '2951-2',
              conventionalUnit: null,
              teaPct: null,
              teaSource: null,
              teaDate: null,
              retired: true,
              retiredAt: '2026-10-01T00:00:00.000Z',
            }),
          ],
        },
      },
    });
    renderApp('/network/catalogue', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Analytes' });
    await within(table).findByText('Glucose');
    const rows = within(table).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(rows[0].textContent).toContain('2345-7');
    expect(rows[0].textContent).toContain('6.9 %');
    // Both TEa parts, as the rule reads ("± X or Y %"), and the plausibility limits.
    expect(rows[0].textContent).toContain('± 0.33 mmol/L or 6.9 %');
    expect(rows[0].textContent).toContain('0.5 – 50');
    expect(rows[1].textContent).toContain('Sodium');
    expect(within(rows[1]).getByText('Retired')).toBeTruthy();
    expect(within(rows[1]).getByRole('button', { name: 'Restore NA' })).toBeTruthy();

    // The first page of in-use entries, sorted by code.
    const request = api.requests.find((r) => r.path === '/api/catalogue/analytes');
    expect(Object.fromEntries(request!.query)).toMatchObject({
      state: 'active',
      sort: 'code',
      order: 'asc',
      offset: '0',
    });
  });

  it('when a column header is clicked, then the API is asked for that sort', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/control-lots': { status: 200, body: { total: 1, items: [buildControlLot()] } },
    });
    const { user } = renderApp('/network/catalogue?list=control-lots', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: 'Control lots' });
    await within(table).findByText('TCM-2611');
    await user.click(within(table).getByRole('button', { name: /Expires/ }));

    await waitFor(() =>
      expect(
        api.requests.some((r) => r.query.get('sort') === 'expiresOn' && r.query.get('order') === 'asc'),
      ).toBe(true),
    );
  });

  it('when the API rejects a new analyte’s unit, then its message appears beside the unit field', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/analytes': { status: 200, body: { total: 0, items: [] } },
      'POST /api/catalogue/analytes': {
        status: 400,
        body: {
          error: {
            code: 'bad_request',
            message: 'Invalid body: unit: "mmol/Lx" is not a UCUM unit',
            details: [{ path: 'unit', message: '"mmol/Lx" is not a UCUM unit' }],
          },
        },
      },
    });
    const { user } = renderApp('/network/catalogue', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'New analyte' }));
    const dialog = await screen.findByRole('dialog', { name: 'New analyte' });
    await user.type(within(dialog).getByLabelText('Code'), 'K');
    await user.type(within(dialog).getByLabelText('Name'), 'Potassium');
    await user.type(within(dialog).getByLabelText('Unit (UCUM)'), 'mmol/Lx');
    await user.click(within(dialog).getByRole('button', { name: 'Create' }));

    const unit = within(dialog).getByLabelText('Unit (UCUM)');
    await waitFor(() => expect(unit.getAttribute('aria-invalid')).toBe('true'));
    expect(within(dialog).getByText('"mmol/Lx" is not a UCUM unit')).toBeTruthy();
    // The name field was accepted and is not marked.
    expect(within(dialog).getByLabelText('Name').getAttribute('aria-invalid')).toBeNull();
    const sent = api.requests.find((r) => r.method === 'POST');
    expect(sent?.body).toMatchObject({
      code: 'K',
      name: 'Potassium',
      unit: 'mmol/Lx',
      decimals: 2,
      loinc: null,
    });
  });

  it('when a LOINC code has a wrong check digit, then the form says so and nothing is sent', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/analytes': { status: 200, body: { total: 0, items: [] } },
    });
    const { user } = renderApp('/network/catalogue', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'New analyte' }));
    const dialog = await screen.findByRole('dialog', { name: 'New analyte' });
    await user.type(within(dialog).getByLabelText('Code'), 'GLU');
    await user.type(within(dialog).getByLabelText('Name'), 'Glucose');
    await user.type(within(dialog).getByLabelText('Unit (UCUM)'), 'mmol/L');
    // LOINC Users' Guide mod-10 check digit: 2345 → 7, so 2345-8 is wrong.
    await user.type(within(dialog).getByLabelText('LOINC code, optional'), '2345-8');
    await user.click(within(dialog).getByRole('button', { name: 'Create' }));

    expect(await within(dialog).findByText(/check digit does not match: 2345-7 expected/i)).toBeTruthy();
    expect(api.requests.some((r) => r.method === 'POST')).toBe(false);
  });

  it('when the coordinator fills in plausibility limits and a TEa absolute part, then they are sent as numbers with their source', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/analytes': { status: 200, body: { total: 0, items: [] } },
      'POST /api/catalogue/analytes': { status: 201, body: buildAnalyte() },
    });
    const { user } = renderApp('/network/catalogue', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'New analyte' }));
    const dialog = await screen.findByRole('dialog', { name: 'New analyte' });
    await user.type(within(dialog).getByLabelText('Code'), 'BE');
    await user.type(within(dialog).getByLabelText('Name'), 'Base excess');
    await user.type(within(dialog).getByLabelText('Unit (UCUM)'), 'mmol/L');
    await user.type(within(dialog).getByLabelText('TEa (± in the unit)'), '0,5');
    await user.type(within(dialog).getByLabelText('Low limit'), '-30');
    await user.type(within(dialog).getByLabelText('High limit'), '30');
    await user.type(within(dialog).getByLabelText('Source of the limits'), 'common practice');
    await user.selectOptions(within(dialog).getByLabelText('Results below zero'), 'Possible');
    await user.click(within(dialog).getByRole('button', { name: 'Create' }));

    await waitFor(() => expect(api.requests.some((r) => r.method === 'POST')).toBe(true));
    expect(api.requests.find((r) => r.method === 'POST')?.body).toMatchObject({
      teaAbsolute: 0.5,
      plausibleLow: -30,
      plausibleHigh: 30,
      plausibilitySource: 'common practice',
      allowsNegative: true,
    });
  });
});

describe('catalogue CSV import', () => {
  it('when the preview has a row with errors, then the row lists them and applying is disabled', async () => {
    const api = mockApi({
      ...me,
      'GET /api/catalogue/methods': { status: 200, body: { total: 0, items: [] } },
      'POST /api/catalogue/methods/import': buildImportResultAnswer(),
    });
    const { user } = renderApp('/network/catalogue?list=methods', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Import CSV' }));
    const dialog = await screen.findByRole('dialog', { name: 'Import methods from CSV' });
    const file = new File(
      ['code,name\nENZ,Enzymatic\n,Nameless\nISE,Ion-selective electrode\n'],
      'methods.csv',
      {
        type: 'text/csv',
      },
    );
    await user.upload(within(dialog).getByLabelText(/CSV file/), file);
    await user.click(within(dialog).getByRole('button', { name: 'Check the file' }));

    const table = await within(dialog).findByRole('table');
    // Rows with errors are shown first on their own; the whole report is one click away.
    expect(within(table).getByText(/use 1 to 40 letters/)).toBeTruthy();
    expect(within(dialog).getByText(/1 with errors/)).toBeTruthy();
    const apply = within(dialog).getByRole('button', { name: 'Apply import' }) as HTMLButtonElement;
    expect(apply.disabled).toBe(true);
    expect(apply.getAttribute('aria-describedby')).toBeTruthy();

    await user.click(within(dialog).getByLabelText('Show only rows with errors'));
    expect(within(table).getAllByRole('row')).toHaveLength(4);

    const preview = api.requests.find((r) => r.path === '/api/catalogue/methods/import');
    expect(preview?.query.get('dryRun')).toBe('true');
    expect(preview?.body).toBeInstanceOf(FormData);
    expect(api.requests.filter((r) => r.path === '/api/catalogue/methods/import')).toHaveLength(1);
  });

  it('when the preview has no errors, then applying sends the file again without dry run', async () => {
    let calls = 0;
    const api = mockApi({
      ...me,
      'GET /api/catalogue/methods': { status: 200, body: { total: 0, items: [] } },
      'POST /api/catalogue/methods/import': () => {
        calls += 1;
        const result = buildImportResult([
          { row: 2, action: 'create', data: { code: 'ENZ', name: 'Enzymatic' } },
        ]);
        return { status: 200, body: { ...result, applied: calls > 1 } };
      },
    });
    const { user } = renderApp('/network/catalogue?list=methods', { signedInAs: 'coordinator' });

    await user.click(await screen.findByRole('button', { name: 'Import CSV' }));
    const dialog = await screen.findByRole('dialog', { name: 'Import methods from CSV' });
    await user.upload(
      within(dialog).getByLabelText(/CSV file/),
      new File(['code,name\nENZ,Enzymatic\n'], 'm.csv'),
    );
    await user.click(within(dialog).getByRole('button', { name: 'Check the file' }));
    const apply = await within(dialog).findByRole('button', { name: 'Apply import' });
    expect((apply as HTMLButtonElement).disabled).toBe(false);
    await user.click(apply);

    await waitFor(() => expect(screen.queryByRole('dialog')).toBeNull());
    const imports = api.requests.filter((r) => r.path === '/api/catalogue/methods/import');
    expect(imports.map((r) => r.query.get('dryRun'))).toEqual(['true', 'false']);
    expect(await screen.findByText(/Imported m.csv: 1 new, 0 updated/)).toBeTruthy();
  });
});

function buildImportResultAnswer() {
  return {
    status: 200,
    body: buildImportResult([
      { row: 2, action: 'create', data: { code: 'ENZ', name: 'Enzymatic' } },
      {
        row: 3,
        action: 'error',
        errors: [{ column: 'code', message: 'use 1 to 40 letters, digits, dots, hyphens or underscores' }],
      },
      { row: 4, action: 'update', data: { code: 'ISE', name: 'Ion-selective electrode' }, changes: ['name'] },
    ]),
  };
}
