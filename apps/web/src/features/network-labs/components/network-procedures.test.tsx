import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { networkProcedureSchema } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { testLabs } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';

const ref = (n: number, code: string, name: string) => ({
  id: `1e2d3c4b-5a69-4788-9a0b-1c2d3e4f50${String(n).padStart(2, '0')}`,
  code,
  name,
});
const tier = (labs: number) => ({ labs, enough: labs >= 3 });

const procedure = (n: number, labs: [number, number, number]) =>
  networkProcedureSchema.parse({
    id: ref(n, 'x', 'x').id,
    code: `K-${n}`,
    unit: 'mmol/L',
    lab: { ...testLabs[0], active: true },
    analyte: ref(90, 'K', 'Potassium'),
    instrumentModel: ref(91, 'VX-200', 'Vexa 200 analyser'),
    method: ref(92, 'ISE-I', 'Indirect ISE'),
    reagent: ref(93, 'VX-K', 'Vexa potassium kit'),
    peerable: { instrument: tier(labs[0]), method: tier(labs[1]), analyte: tier(labs[2]) },
    unpeerable: labs.every((l) => l < 3),
  });

describe('network procedures', () => {
  it('when only unpeerable procedures are asked for, then the API gets unpeerable=true and the rows are marked', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('coordinator') },
      'GET /api/labs': { status: 200, body: testLabs },
      'GET /api/catalogue/analytes': { status: 200, body: { total: 0, items: [] } },
      'GET /api/catalogue/instrument-models': { status: 200, body: { total: 0, items: [] } },
      'GET /api/catalogue/methods': { status: 200, body: { total: 0, items: [] } },
      'GET /api/network/procedures': (request) => {
        const onlyUnpeerable = request.query.get('unpeerable') === 'true';
        const items = onlyUnpeerable
          ? [procedure(2, [1, 2, 2])]
          : [procedure(1, [4, 5, 9]), procedure(2, [1, 2, 2])];
        return { status: 200, body: { total: items.length, minLabs: 3, items } };
      },
    });
    const { user } = renderApp('/network/procedures', { signedInAs: 'coordinator' });

    const table = await screen.findByRole('table', { name: /Measurement procedures/ });
    await within(table).findByText('K-1');
    expect(screen.getByText(/cannot be peered at any tier/).textContent).toMatch(
      /1\s+cannot be peered at any tier \(fewer than 3 labs\)/,
    );
    expect(within(table).getByText('Instrument tier')).toBeTruthy();
    expect(within(table).getByText('No peer group')).toBeTruthy();

    await user.click(screen.getByLabelText('Only procedures without a peer group'));
    await waitFor(() => expect(within(table).queryByText('K-1')).toBeNull());
    const last = api.requests
      .filter((r) => r.path === '/api/network/procedures' && r.query.get('limit') === '50')
      .at(-1);
    expect(Object.fromEntries(last!.query)).toEqual({
      unpeerable: 'true',
      minLabs: '3',
      limit: '50',
      offset: '0',
    });
  });
});
