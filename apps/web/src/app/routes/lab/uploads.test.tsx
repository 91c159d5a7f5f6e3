import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import type { PeerReport } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi, type MockAnswer, type RecordedRequest } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import {
  buildPeerReport,
  buildSummaryPreview,
  buildUploadDetail,
  buildUploadSummary,
  testLabId,
  testUploadId,
} from '../../../testing/upload-data.ts';

// One open period with a deadline far ahead, so the default period does not depend on today's date.
const periods = [
  { period: '2026-12', state: 'open', deadline: '2099-01-10T23:59:00.000Z' },
  { period: '2026-11', state: 'published', deadline: '2026-12-10T23:59:00.000Z' },
];
const reportPath = `GET /api/labs/${testLabId}/peer-report`;

/** Answers the peer report per period from `reports`, which the test may change as it goes. */
function reportHandler(reports: Record<string, PeerReport>) {
  return (request: RecordedRequest): MockAnswer => {
    const period = request.query.get('period') ?? '';
    return { status: 200, body: reports[period] ?? buildPeerReport(period, []) };
  };
}

function reportPanel() {
  return screen.getByRole('region', { name: 'Report for the period' });
}

describe('uploads page', () => {
  it('when an analyst opens it, then the upload steps, the period report and the lab’s uploads show', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [reportPath]: reportHandler({
        '2026-12': buildPeerReport('2026-12', [
          { code: 'K1', level: 1, mean: 4.12 },
          { code: 'K1', level: 2, mean: 6.48 },
        ]),
      }),
      'GET /api/uploads': {
        status: 200,
        body: [
          buildUploadSummary({ status: 'needs-review', rowsTotal: 24, rowsAccepted: 23, rowsRejected: 1 }),
          buildUploadSummary({
            id: '0f1e2d3c-4b5a-4697-8877-665544332211',
            filename: 'october-summary.csv',
            status: 'stored',
            rowsTotal: 24,
            rowsAccepted: 24,
            via: 'api-token',
            uploadedBy: null,
          }),
        ],
      },
    });
    renderApp('/lab/uploads', { signedInAs: 'analyst' });

    expect(await screen.findByRole('heading', { name: 'Uploads', level: 1 })).toBeTruthy();
    expect((screen.getByLabelText('Monthly summary') as HTMLInputElement).checked).toBe(true);
    expect((screen.getByLabelText('Choose a file') as HTMLInputElement).type).toBe('file');
    const history = await screen.findByRole('table', { name: 'Your lab’s uploads' });
    const rows = within(history).getAllByRole('row').slice(1);
    expect(rows).toHaveLength(2);
    expect(within(rows[0]).getByText('Waiting for your decision')).toBeTruthy();
    expect(within(rows[1]).getByText('Stored')).toBeTruthy();
    expect(within(rows[1]).getByText('Lab API token')).toBeTruthy();

    await waitFor(() => expect(within(reportPanel()).getByText('results stored')).toBeTruthy());
    expect((within(reportPanel()).getByLabelText('Period') as HTMLSelectElement).value).toBe('2026-12');
  });

  it('when an upload being checked becomes stored, then the period report is fetched again and shows the new results', async () => {
    const reports: Record<string, PeerReport> = { '2026-12': buildPeerReport('2026-12', []) };
    let detailCalls = 0;
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [reportPath]: reportHandler(reports),
      'GET /api/uploads': {
        status: 200,
        body: [buildUploadSummary({ status: 'processing', progress: 0.5 })],
      },
      [`GET /api/uploads/${testUploadId}`]: () => {
        detailCalls += 1;
        if (detailCalls === 1)
          return { status: 200, body: buildUploadDetail({ status: 'processing', progress: 0.5 }) };
        // The worker has stored the file: the lab now has results for the period.
        reports['2026-12'] = buildPeerReport('2026-12', [
          { code: 'K1', level: 1, mean: 4.12 },
          { code: 'K1', level: 2, mean: 6.48 },
        ]);
        return {
          status: 200,
          body: buildUploadDetail({ status: 'stored', progress: 1, rowsTotal: 2, rowsAccepted: 2 }),
        };
      },
    });
    const { user } = renderApp('/lab/uploads', { signedInAs: 'analyst' });
    await waitFor(() =>
      expect(within(reportPanel()).getByText(/No results of your lab are stored/)).toBeTruthy(),
    );

    await user.click(await screen.findByRole('button', { name: 'november-summary.csv' }));

    expect(await screen.findByText('Stored: 2 rows accepted', {}, { timeout: 3000 })).toBeTruthy();
    await waitFor(() => expect(within(reportPanel()).getByText('results stored')).toBeTruthy());
    expect(within(reportPanel()).getByText('4.120')).toBeTruthy();
    expect(
      api.requests.filter((r) => r.path === `/api/labs/${testLabId}/peer-report`).length,
    ).toBeGreaterThanOrEqual(2);
  });

  it('when a file sent from the page is stored, then the report panel turns to the file’s month', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [reportPath]: reportHandler({
        '2026-11': buildPeerReport('2026-11', [{ code: 'K1', level: 1, mean: 4.12 }]),
      }),
      'GET /api/uploads': { status: 200, body: [] },
      'POST /api/uploads/preview': { status: 200, body: buildSummaryPreview() },
      'POST /api/uploads': { status: 202, body: { id: testUploadId, status: 'queued' } },
      [`GET /api/uploads/${testUploadId}`]: {
        status: 200,
        body: buildUploadDetail({ status: 'stored', progress: 1, rowsTotal: 2, rowsAccepted: 2 }),
      },
    });
    const { user } = renderApp('/lab/uploads', { signedInAs: 'analyst' });
    expect(await screen.findByText('No file has been uploaded for your lab yet.')).toBeTruthy();

    await user.upload(
      screen.getByLabelText('Choose a file'),
      new File(['Month;Test code\n2026-11;K1\n'], 'november-summary.csv', { type: 'text/csv' }),
    );
    await user.click(await screen.findByRole('button', { name: 'Upload and check the file' }));

    expect(await screen.findByText('Stored: 2 rows accepted')).toBeTruthy();
    await waitFor(() =>
      expect((within(reportPanel()).getByLabelText('Period') as HTMLSelectElement).value).toBe('2026-11'),
    );
    await waitFor(() => expect(within(reportPanel()).getByText('results stored')).toBeTruthy());
  });
});
