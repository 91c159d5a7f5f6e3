import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { buildAdjustment, buildMergePreview, buildView, ids } from '../utils/test-data.ts';
import { AdjustmentDialog, type AdjustmentContext } from './adjustment-dialog.tsx';

const context: AdjustmentContext = {
  controlLotId: ids.lot,
  period: '2026-11',
  level: 1,
  decimals: 1,
  unit: 'mmol/L',
};

describe('the adjustment dialog', () => {
  it('when two groups are merged, then the preview shows before and after side by side, and only a confirmation with a reason applies it', async () => {
    const view = buildView();
    const [a, b] = view.tiers[0].groups;
    const api = mockApi({
      'POST /api/peer-groups/merge/preview': { status: 200, body: buildMergePreview() },
      'POST /api/peer-groups/merge': { status: 201, body: buildAdjustment() },
    });
    const onClose = vi.fn();
    const { user } = renderComponent(
      <AdjustmentDialog request={{ kind: 'merge', groups: [a, b] }} context={context} onClose={onClose} />,
    );

    const dialog = await screen.findByRole('dialog', { name: 'Merge two groups' });
    // The larger group stays by default; the preview is asked for the level and period on the page.
    const before = await within(dialog).findByRole('region', { name: 'Before, level 1' });
    const after = within(dialog).getByRole('region', { name: 'After, level 1' });
    expect(api.requests.find((r) => r.path === '/api/peer-groups/merge/preview')?.body).toEqual({
      sourceGroupId: b.id,
      targetGroupId: a.id,
      period: '2026-11',
      level: 1,
    });
    expect(
      within(before)
        .getAllByRole('article')
        .map((x) => x.getAttribute('aria-label')),
    ).toEqual([b.label, a.label]);
    const merged = within(after).getByRole('article', { name: a.label });
    // Mean with the analyte's decimals + 2 (1 + 2 = 3).
    expect(within(merged).getByText('5.543')).toBeTruthy();
    expect(within(merged).getByText(/Members: PX-001, PX-002, PX-003, PX-004, PX-005/)).toBeTruthy();
    expect(
      within(within(before).getByRole('article', { name: b.label })).getByText('Too few labs to publish'),
    ).toBeTruthy();

    // No reason: nothing is applied.
    await user.click(within(dialog).getByRole('button', { name: 'Confirm merge' }));
    expect(await within(dialog).findByText(/Say why/)).toBeTruthy();
    expect(api.requests.some((r) => r.path === '/api/peer-groups/merge')).toBe(false);

    await user.type(within(dialog).getByLabelText(/Why do these groups belong together/), 'same optics');
    await user.click(within(dialog).getByRole('button', { name: 'Confirm merge' }));
    await waitFor(() => expect(onClose).toHaveBeenCalled());
    expect(api.requests.find((r) => r.path === '/api/peer-groups/merge')?.body).toEqual({
      sourceGroupId: b.id,
      targetGroupId: a.id,
      reason: 'same optics',
    });
  });

  it('when the group that stays is changed, then a new preview is asked for with the groups swapped', async () => {
    const view = buildView();
    const [a, b] = view.tiers[0].groups;
    const api = mockApi({
      'POST /api/peer-groups/merge/preview': { status: 200, body: buildMergePreview() },
    });
    const { user } = renderComponent(
      <AdjustmentDialog request={{ kind: 'merge', groups: [a, b] }} context={context} onClose={() => {}} />,
    );
    const dialog = await screen.findByRole('dialog', { name: 'Merge two groups' });
    await within(dialog).findByRole('region', { name: 'After, level 1' });
    await user.selectOptions(within(dialog).getByLabelText('Group that stays'), b.id);
    await waitFor(() =>
      expect(
        api.requests.filter((r) => r.path === '/api/peer-groups/merge/preview').map((r) => r.body),
      ).toContainEqual({
        sourceGroupId: a.id,
        targetGroupId: b.id,
        period: '2026-11',
        level: 1,
      }),
    );
  });

  it('when the preview is refused, then its reason shows and the change cannot be confirmed', async () => {
    const view = buildView();
    const member = view.tiers[0].groups[0].members[0];
    mockApi({
      'POST /api/peer-groups/exclusions/preview': {
        status: 422,
        body: {
          error: {
            code: 'validation_failed',
            message: 'period: PX-001 GLU1 has no data on the lot QC-7781 for 2026-11',
            details: [{ path: 'period', message: 'PX-001 GLU1 has no data on the lot QC-7781 for 2026-11' }],
          },
        },
      },
    });
    renderComponent(
      <AdjustmentDialog request={{ kind: 'exclude', member }} context={context} onClose={() => {}} />,
    );
    const dialog = await screen.findByRole('dialog', { name: 'Exclude a lab’s data' });
    expect(await within(dialog).findByText(/has no data on the lot QC-7781/)).toBeTruthy();
    expect(
      (within(dialog).getByRole('button', { name: 'Confirm exclusion' }) as HTMLButtonElement).disabled,
    ).toBe(true);
  });

  it('when an exclusion is widened to every level, then the preview and the exclusion cover every level', async () => {
    const view = buildView();
    const member = view.tiers[0].groups[0].members[0];
    const preview = { ...buildMergePreview(), kind: 'exclude', description: 'Exclude PX-001 GLU1' };
    const api = mockApi({
      'POST /api/peer-groups/exclusions/preview': { status: 200, body: preview },
      'POST /api/peer-groups/exclusions': {
        status: 201,
        body: buildAdjustment({ kind: 'exclude', period: '2026-11' }),
      },
    });
    const { user } = renderComponent(
      <AdjustmentDialog request={{ kind: 'exclude', member }} context={context} onClose={() => {}} />,
    );
    const dialog = await screen.findByRole('dialog', { name: 'Exclude a lab’s data' });
    await within(dialog).findByRole('region', { name: 'After, level 1' });
    await user.selectOptions(within(dialog).getByLabelText('Levels'), 'all');
    await waitFor(() =>
      expect(api.requests.map((r) => r.body)).toContainEqual({
        procedureId: member.procedureId,
        controlLotId: ids.lot,
        period: '2026-11',
        level: null,
      }),
    );
    await user.type(within(dialog).getByLabelText(/Why is this lab’s data left out/), 'analyser fault');
    await user.click(within(dialog).getByRole('button', { name: 'Confirm exclusion' }));
    await waitFor(() =>
      expect(api.requests.find((r) => r.path === '/api/peer-groups/exclusions')?.body).toEqual({
        procedureId: member.procedureId,
        controlLotId: ids.lot,
        period: '2026-11',
        level: null,
        reason: 'analyser fault',
      }),
    );
  });
});
