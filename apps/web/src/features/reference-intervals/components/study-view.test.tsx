import { screen, waitFor } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { REFERENCE_INTERVAL_CAUTION, studyDetailSchema } from '@plumbline/contracts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { StudyView } from './study-view.tsx';
import { parseResults } from './verifications.tsx';

const studyId = '3c4d5e6f-0000-4000-8000-000000000001';
// Invented figures; the component only displays what the API computed.
const detail = studyDetailSchema.parse({
  id: studyId,
  labId: '3c4d5e6f-0000-4000-8000-000000000002',
  name: 'Sodium, invented',
  analyte: { id: '3c4d5e6f-0000-4000-8000-000000000003', code: 'NA', name: 'Sodium', unit: 'mmol/L' },
  selection: { ageLow: 18, ageHigh: 120, sex: 'all' },
  partitioning: { bySex: false, ageBands: [] },
  method: 'nonparametric',
  screening: 'tukey',
  status: 'done',
  progress: 1,
  failureMessage: null,
  createdAt: '2026-12-01T08:00:00.000Z',
  latestVersion: 1,
  approvedVersion: null,
  caution: REFERENCE_INTERVAL_CAUTION,
  results: [
    {
      id: '3c4d5e6f-0000-4000-8000-000000000004',
      version: 1,
      computedAt: '2026-12-01T08:01:00.000Z',
      unit: 'mmol/L',
      advice: [],
      approval: null,
      partitions: [
        {
          key: { sex: 'all', ageLow: 18, ageHigh: 120 },
          label: 'Both sexes, 18–120 years',
          n: 300,
          excluded: [120],
          excludedCount: 1,
          method: 'nonparametric',
          lower: { value: 136, ci: [135, 137] },
          upper: { value: 144, ci: [143, 145] },
          note: null,
          histogram: [
            { from: 134, to: 140, count: 150 },
            { from: 140, to: 146, count: 149 },
          ],
          current: { lower: 135, upper: 145, source: 'Invented source' },
        },
      ],
    },
  ],
});

describe('the study page', () => {
  it('when a result is shown, then the caution, the histogram, the limits with CIs and the interval in use appear, and approval sends the statement', async () => {
    const { requests } = mockApi({
      [`GET /api/reference-intervals/studies/${studyId}`]: { status: 200, body: detail },
      [`POST /api/reference-intervals/studies/${studyId}/versions/1/approve`]: {
        status: 200,
        body: {
          ...detail.results[0],
          approval: { approvedAt: '2026-12-02T00:00:00.000Z', approvedBy: 'A', statement: 'ok' },
        },
      },
    });
    const { user } = renderComponent(<StudyView studyId={studyId} canManage />);
    await screen.findByRole('heading', { name: 'Version 1' });
    expect(screen.getByRole('note').textContent).toMatch(/laboratory director before clinical use/);
    expect(screen.getByRole('img', { name: /Histogram of 300 values/ })).toBeTruthy();
    expect(screen.getByTestId('lower-limit').textContent).toBe('136.0 (90 % CI 135.0–137.0) mmol/L');
    expect(screen.getByText(/135–145 mmol\/L \(Invented source\)/)).toBeTruthy();
    await user.type(screen.getByLabelText('Approval statement'), 'Reviewed with the director.');
    await user.click(screen.getByRole('button', { name: 'Approve version 1' }));
    await waitFor(() => expect(requests.some((r) => r.method === 'POST')).toBe(true));
    expect(requests.find((r) => r.method === 'POST')!.body).toEqual({
      statement: 'Reviewed with the director.',
    });
  });

  it('when an analyst looks, then there is nothing to approve or run', async () => {
    mockApi({ [`GET /api/reference-intervals/studies/${studyId}`]: { status: 200, body: detail } });
    renderComponent(<StudyView studyId={studyId} canManage={false} />);
    await screen.findByRole('heading', { name: 'Version 1' });
    expect(screen.queryByRole('button', { name: /Approve/ })).toBeNull();
    expect(screen.queryByRole('button', { name: /Run again/ })).toBeNull();
  });
});

describe('pasted verification results', () => {
  it('when numbers are separated by lines, commas or spaces, then all are read; other text is refused', () => {
    expect(parseResults('4.1\n4,2; 3.9 5')).toEqual([4.1, 4, 2, 3.9, 5]);
    expect(parseResults('4.1 abc')).toBeNull();
  });
});
