import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import type { RowError } from '@plumbline/contracts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { buildUploadDetail, buildUploadSummary, testUploadId } from '../../../testing/upload-data.ts';
import { UploadStatusView } from './upload-status-view.tsx';

const detailPath = `GET /api/uploads/${testUploadId}`;

const rowErrors: RowError[] = [
  {
    row: 7,
    column: 'Std dev',
    code: 'sd_not_positive',
    message: 'The SD must be greater than 0; found -0.04.',
  },
  { row: 3, column: 'Lot', code: 'unknown_control_lot', message: 'Control lot "PGC-99999" is not known.' },
  { row: 12, column: null, code: 'wrong_column_count', message: 'Line 12 has 6 cells; the header has 8.' },
];

function needsReview() {
  return buildUploadDetail({
    status: 'needs-review',
    progress: 1,
    rowsTotal: 24,
    rowsAccepted: 21,
    rowsRejected: 3,
    errors: rowErrors,
  });
}

/** The text of one column's cells, top to bottom (0 = line, 1 = column, 2 = code, 3 = message). */
function columnTexts(table: HTMLElement, index: number): string[] {
  return within(table)
    .getAllByRole('row')
    .slice(1)
    .map((row) => within(row).getAllByRole('cell')[index]?.textContent ?? '');
}

describe('upload status', () => {
  it('when the worker is part way through the file, then the progress bar shows how far it is', async () => {
    mockApi({
      [detailPath]: { status: 200, body: buildUploadDetail({ status: 'processing', progress: 0.42 }) },
    });
    renderComponent(<UploadStatusView uploadId={testUploadId} initialStatus="queued" />);

    const bar = await screen.findByRole('progressbar');
    expect(bar.getAttribute('aria-valuenow')).toBe('42');
    expect(bar.getAttribute('aria-valuemin')).toBe('0');
    expect(bar.getAttribute('aria-valuemax')).toBe('100');
    expect(bar.getAttribute('aria-label')).toBe('Checking november-summary.csv');
  });

  it('when the upload moves on between polls, then the bar follows it and "stored" is reported once', async () => {
    const answers = [
      buildUploadDetail({ status: 'processing', progress: 0.25 }),
      buildUploadDetail({ status: 'processing', progress: 0.75 }),
      buildUploadDetail({ status: 'stored', progress: 1, rowsTotal: 24, rowsAccepted: 24 }),
    ];
    let call = 0;
    mockApi({ [detailPath]: () => ({ status: 200, body: answers[Math.min(call++, answers.length - 1)] }) });
    const onStored = vi.fn();
    renderComponent(<UploadStatusView uploadId={testUploadId} initialStatus="queued" onStored={onStored} />);

    await waitFor(() => expect(screen.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('25'));
    await waitFor(() => expect(screen.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('75'), {
      timeout: 3000,
    });
    expect(await screen.findByText('Stored: 24 rows accepted', {}, { timeout: 3000 })).toBeTruthy();
    expect(screen.queryByRole('progressbar')).toBeNull();
    expect(onStored).toHaveBeenCalledTimes(1);
  });

  it('when an upload is opened already stored, then it does not count as newly stored', async () => {
    mockApi({
      [detailPath]: {
        status: 200,
        body: buildUploadDetail({ status: 'stored', rowsTotal: 8, rowsAccepted: 8 }),
      },
    });
    const onStored = vi.fn();
    renderComponent(<UploadStatusView uploadId={testUploadId} onStored={onStored} />);

    await screen.findByText('Stored: 8 rows accepted');
    expect(onStored).not.toHaveBeenCalled();
  });

  it('when the upload waits for review, then the rejected rows are listed and nothing is said to be stored', async () => {
    mockApi({ [detailPath]: { status: 200, body: needsReview() } });
    renderComponent(<UploadStatusView uploadId={testUploadId} />);

    expect(await screen.findByText('3 rows of 24 rejected: nothing is stored until you decide')).toBeTruthy();
    const table = screen.getByRole('table', { name: /Rejected rows/ });
    // Sorted by line number at first.
    expect(columnTexts(table, 0)).toEqual(['3', '7', '12']);
    expect(within(table).getByText('sd_not_positive')).toBeTruthy();
    expect(within(table).getByText('The SD must be greater than 0; found -0.04.')).toBeTruthy();
    expect(within(table).getByText('whole row')).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Store the valid rows' })).toBeTruthy();
    expect(screen.getByRole('button', { name: 'Discard this upload' })).toBeTruthy();
  });

  it('when a column header is clicked, then the rejected rows are sorted by it, and a second click reverses them', async () => {
    mockApi({ [detailPath]: { status: 200, body: needsReview() } });
    const { user } = renderComponent(<UploadStatusView uploadId={testUploadId} />);
    const table = await screen.findByRole('table', { name: /Rejected rows/ });
    const problemHeader = within(table).getByRole('columnheader', { name: /Problem/ });

    await user.click(within(problemHeader).getByRole('button'));
    expect(problemHeader.getAttribute('aria-sort')).toBe('ascending');
    expect(columnTexts(table, 2)).toEqual(['sd_not_positive', 'unknown_control_lot', 'wrong_column_count']);

    await user.click(within(problemHeader).getByRole('button'));
    expect(problemHeader.getAttribute('aria-sort')).toBe('descending');
    expect(columnTexts(table, 2)).toEqual(['wrong_column_count', 'unknown_control_lot', 'sd_not_positive']);
  });

  it('when "Store the valid rows" is pressed, then the upload is confirmed and followed again', async () => {
    let confirmed = false;
    const api = mockApi({
      [detailPath]: () => ({
        status: 200,
        body: confirmed
          ? buildUploadDetail({
              status: 'processing',
              progress: 0.5,
              rowsTotal: 24,
              rowsAccepted: 21,
              rowsRejected: 3,
              confirmedAt: '2026-12-01T09:35:00.000Z',
            })
          : needsReview(),
      }),
      [`POST /api/uploads/${testUploadId}/confirm`]: () => {
        confirmed = true;
        return {
          status: 200,
          body: buildUploadSummary({
            status: 'queued',
            rowsTotal: 24,
            rowsAccepted: 21,
            rowsRejected: 3,
            confirmedAt: '2026-12-01T09:35:00.000Z',
          }),
        };
      },
    });
    const { user } = renderComponent(<UploadStatusView uploadId={testUploadId} />);

    await user.click(await screen.findByRole('button', { name: 'Store the valid rows' }));

    const bar = await screen.findByRole('progressbar', { name: 'Storing the valid rows' });
    expect(bar).toBeTruthy();
    const posts = api.requests.filter((r) => r.method === 'POST').map((r) => r.path);
    expect(posts).toEqual([`/api/uploads/${testUploadId}/confirm`]);
  });

  it('when "Discard this upload" is pressed, then the upload is cancelled and shown as discarded', async () => {
    let cancelled = false;
    const api = mockApi({
      [detailPath]: () => ({
        status: 200,
        body: cancelled ? buildUploadDetail({ ...needsReview(), status: 'cancelled' }) : needsReview(),
      }),
      [`POST /api/uploads/${testUploadId}/cancel`]: () => {
        cancelled = true;
        return {
          status: 200,
          body: buildUploadSummary({ status: 'cancelled', rowsTotal: 24, rowsAccepted: 21, rowsRejected: 3 }),
        };
      },
    });
    const { user } = renderComponent(<UploadStatusView uploadId={testUploadId} />);

    await user.click(await screen.findByRole('button', { name: 'Discard this upload' }));

    expect(await screen.findByText('Discarded')).toBeTruthy();
    expect(screen.getByText('Nothing from this file was stored.')).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Store the valid rows' })).toBeNull();
    const posts = api.requests.filter((r) => r.method === 'POST').map((r) => r.path);
    expect(posts).toEqual([`/api/uploads/${testUploadId}/cancel`]);
  });

  it('when no row of the file is valid, then only discarding is offered', async () => {
    mockApi({
      [detailPath]: {
        status: 200,
        body: buildUploadDetail({
          status: 'needs-review',
          progress: 1,
          rowsTotal: 2,
          rowsAccepted: 0,
          rowsRejected: 2,
          errors: rowErrors.slice(0, 2),
        }),
      },
    });
    renderComponent(<UploadStatusView uploadId={testUploadId} />);

    expect(await screen.findByText(/there is nothing to store/)).toBeTruthy();
    expect(screen.queryByRole('button', { name: 'Store the valid rows' })).toBeNull();
    expect(screen.getByRole('button', { name: 'Discard this upload' })).toBeTruthy();
  });

  it('when the confirm is refused, then the API message is shown', async () => {
    const message = 'Only an upload waiting for review can be confirmed; this one is cancelled.';
    mockApi({
      [detailPath]: { status: 200, body: needsReview() },
      [`POST /api/uploads/${testUploadId}/confirm`]: {
        status: 409,
        body: { error: { code: 'conflict', message } },
      },
    });
    const { user } = renderComponent(<UploadStatusView uploadId={testUploadId} />);

    await user.click(await screen.findByRole('button', { name: 'Store the valid rows' }));

    expect(await screen.findByText(message)).toBeTruthy();
  });

  it('when the file could not be read, then the reason is shown', async () => {
    const failureMessage = 'The file has no "sd" column: map one of its columns to sd.';
    mockApi({ [detailPath]: { status: 200, body: buildUploadDetail({ status: 'failed', failureMessage }) } });
    renderComponent(<UploadStatusView uploadId={testUploadId} />);

    expect(await screen.findByText('This file could not be read')).toBeTruthy();
    expect(screen.getByText(failureMessage)).toBeTruthy();
  });
});
