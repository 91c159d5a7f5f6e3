import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import { buildAdjustment, buildMergePreview, buildView, ids } from '../utils/test-data.ts';

const periods = [
  { period: '2026-12', state: 'open', deadline: '2027-01-10T22:59:00.000Z' },
  { period: '2026-11', state: 'open', deadline: '2026-12-10T22:59:00.000Z' },
  { period: '2026-10', state: 'published', deadline: '2026-11-10T22:59:00.000Z' },
];
const lots = [
  {
    id: ids.lot,
    lotNumber: 'QC-7781',
    material: { id: ids.named, name: 'Chemistry control' },
    levels: [1, 2],
    expiresOn: '2027-08-31',
  },
];
const handlers = () => ({
  'GET /api/me': { status: 200, body: buildMe('coordinator') },
  'GET /api/control-lots': { status: 200, body: lots },
  'GET /api/periods': { status: 200, body: periods },
  'GET /api/peer-groups/analytes': {
    status: 200,
    body: [{ id: ids.analyte, code: 'GLU', name: 'Glucose', unit: 'mmol/L' }],
  },
  'GET /api/peer-groups': { status: 200, body: buildView() },
  'GET /api/peer-groups/adjustments': { status: 200, body: [buildAdjustment()] },
  'POST /api/peer-groups/merge/preview': { status: 200, body: buildMergePreview() },
});

describe('peer groups page', () => {
  it('when the page opens, then the next period to publish is shown with each tier’s groups, and two selected groups can be merged', async () => {
    const api = mockApi(handlers());
    const { user } = renderApp('/network/peer-groups', { signedInAs: 'coordinator' });

    const instrument = await screen.findByRole('table', {
      name: 'Peer groups: same instrument model, method and reagent',
    });
    const query = api.requests.find((r) => r.path === '/api/peer-groups')!.query;
    expect(Object.fromEntries(query)).toEqual({
      controlLotId: ids.lot,
      analyteId: ids.analyte,
      level: '1',
      period: '2026-11',
    });
    const rows = within(instrument).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(rows[0].textContent).toContain('PX-001, PX-002, PX-003');

    // Members with lab code and name.
    await user.click(within(rows[0]).getByRole('button', { name: /Members of/ }));
    expect(await within(instrument).findByText('Invented Lab 2')).toBeTruthy();

    const merge = screen.getByRole('button', { name: /Merge the selected groups \(same instrument/ });
    expect((merge as HTMLButtonElement).disabled).toBe(true);
    await user.click(within(instrument).getByRole('checkbox', { name: /Select Model Q/ }));
    await user.click(within(instrument).getByRole('checkbox', { name: /Select Model W/ }));
    expect((merge as HTMLButtonElement).disabled).toBe(false);
    await user.click(merge);
    const dialog = await screen.findByRole('dialog', { name: 'Merge two groups' });
    expect(await within(dialog).findByRole('region', { name: 'After, level 1' })).toBeTruthy();
  });

  it('when an adjustment is undone, then the undo is sent after a confirmation', async () => {
    const api = mockApi({
      ...handlers(),
      'POST /api/peer-groups/adjustments/41/undo': {
        status: 200,
        body: buildAdjustment({ undone: { at: '2026-12-02T11:00:00.000Z', actor: null, reason: null } }),
      },
    });
    const { user } = renderApp(
      `/network/peer-groups?lot=${ids.lot}&level=1&period=2026-11&analyte=${ids.analyte}`,
      { signedInAs: 'coordinator' },
    );
    const history = await screen.findByRole('table', { name: 'Adjustments of this lot and analyte' });
    await user.click(await within(history).findByRole('button', { name: /^Undo: Merged/ }));
    const dialog = await screen.findByRole('dialog', { name: 'Undo this adjustment?' });
    await user.click(within(dialog).getByRole('button', { name: 'Undo adjustment' }));
    await waitFor(() =>
      expect(api.requests.some((r) => r.path === '/api/peer-groups/adjustments/41/undo')).toBe(true),
    );
  });
});
