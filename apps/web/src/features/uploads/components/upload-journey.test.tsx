import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { mockApi, type RecordedRequest } from '../../../testing/mock-api.ts';
import { renderComponent } from '../../../testing/render-component.tsx';
import { buildSummaryPreview, buildUploadDetail, testUploadId } from '../../../testing/upload-data.ts';
import { UploadJourney } from './upload-journey.tsx';

function csvFile(name = 'november-summary.csv') {
  const text =
    'Month;Test code;Lot;Lvl;Count;Average;Std dev;Units\n2026-11;K1;PGC-26187;1;31;4,12;0,05;mmol/L\n';
  return new File([text], name, { type: 'text/csv' });
}

function formFields(request: RecordedRequest | undefined): Record<string, string> {
  expect(request?.body).toBeInstanceOf(FormData);
  const fields: Record<string, string> = {};
  for (const [key, value] of (request!.body as FormData).entries()) {
    fields[key] = typeof value === 'string' ? value : `file:${(value as File).name}`;
  }
  return fields;
}

const selectOf = (column: string) =>
  screen.getByLabelText(column, { selector: 'select' }) as HTMLSelectElement;

describe('upload journey', () => {
  it('when a file is chosen, then the preview is asked for and the mapping step preselects its suggested columns', async () => {
    const api = mockApi({ 'POST /api/uploads/preview': { status: 200, body: buildSummaryPreview() } });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);

    await user.upload(screen.getByLabelText('Choose a file'), csvFile());

    await screen.findByRole('heading', { name: 'Match the columns of november-summary.csv' });
    expect(selectOf('period').value).toBe('Month');
    expect(selectOf('procedure').value).toBe('Test code');
    expect(selectOf('mean').value).toBe('Average');
    expect(selectOf('sd').value).toBe('Std dev');
    expect(selectOf('unit').value).toBe('Units');
    // The saved mapping is said to be the source, and the file's month is read from the first rows.
    expect(screen.getByText(/saved column choices are filled in/)).toBeTruthy();
    expect(screen.getByText(/Month of the first rows/).textContent).toMatch(/November 2026/);
    expect(formFields(api.requests[0])).toMatchObject({
      kind: 'qc-summary',
      file: 'file:november-summary.csv',
    });
  });

  it('when a required column is set to "not in this file", then the upload button is disabled and the column says why', async () => {
    mockApi({ 'POST /api/uploads/preview': { status: 200, body: buildSummaryPreview() } });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);
    await user.upload(screen.getByLabelText('Choose a file'), csvFile());
    await screen.findByRole('heading', { name: /Match the columns/ });

    await user.selectOptions(selectOf('sd'), '');

    expect(selectOf('sd').getAttribute('aria-invalid')).toBe('true');
    expect(screen.getByText('Choose the column of your file that holds this.')).toBeTruthy();
    const upload = screen.getByRole('button', { name: 'Upload and check the file' }) as HTMLButtonElement;
    expect(upload.disabled).toBe(true);
  });

  it('when one file column is chosen for two columns, then the second one is marked', async () => {
    mockApi({ 'POST /api/uploads/preview': { status: 200, body: buildSummaryPreview() } });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);
    await user.upload(screen.getByLabelText('Choose a file'), csvFile());
    await screen.findByRole('heading', { name: /Match the columns/ });

    await user.selectOptions(selectOf('sd'), 'Average');

    expect(screen.getByText('“Average” is already chosen for mean.')).toBeTruthy();
    expect(
      (screen.getByRole('button', { name: 'Upload and check the file' }) as HTMLButtonElement).disabled,
    ).toBe(true);
  });

  it('when the user changes a column and uploads, then the file is sent with the kind and the edited mapping', async () => {
    const preview = buildSummaryPreview({
      suggestedMapping: { ...buildSummaryPreview().suggestedMapping, unit: null },
    });
    const api = mockApi({
      'POST /api/uploads/preview': { status: 200, body: preview },
      'POST /api/uploads': { status: 202, body: { id: testUploadId, status: 'queued' } },
      [`GET /api/uploads/${testUploadId}`]: { status: 200, body: buildUploadDetail({ status: 'queued' }) },
    });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);
    await user.upload(screen.getByLabelText('Choose a file'), csvFile());
    await screen.findByRole('heading', { name: /Match the columns/ });
    expect(selectOf('unit').value).toBe('');

    await user.selectOptions(selectOf('unit'), 'Units');
    await user.click(screen.getByRole('button', { name: 'Upload and check the file' }));

    await screen.findByRole('progressbar');
    const sent = api.requests.find((r) => r.method === 'POST' && r.path === '/api/uploads');
    const fields = formFields(sent);
    expect(fields.kind).toBe('qc-summary');
    expect(fields.file).toBe('file:november-summary.csv');
    expect(JSON.parse(fields.mapping)).toEqual({
      period: 'Month',
      procedure: 'Test code',
      control_lot: 'Lot',
      level: 'Lvl',
      n: 'Count',
      mean: 'Average',
      sd: 'Std dev',
      unit: 'Units',
    });
  });

  it('when the kind is changed after choosing a file, then the file is previewed again as that kind', async () => {
    const api = mockApi({
      'POST /api/uploads/preview': (request) => {
        const kind = (request.body as FormData).get('kind');
        return kind === 'qc-values'
          ? {
              status: 200,
              body: buildSummaryPreview({
                kind: 'qc-values',
                headers: ['When', 'Test code', 'Lot', 'Lvl', 'Result', 'Units'],
                rows: [['2026-11-03T08:15', 'K1', 'PGC-26187', '1', '4,10', 'mmol/L']],
                suggestedMapping: {
                  measured_at: null,
                  procedure: 'Test code',
                  control_lot: 'Lot',
                  level: 'Lvl',
                  value: 'Result',
                  unit: 'Units',
                  run: null,
                  comment: null,
                },
                mappingSource: 'detected',
                missingColumns: ['measured_at'],
                columns: [
                  { name: 'measured_at', required: true, description: 'date and time' },
                  { name: 'procedure', required: true, description: 'procedure code' },
                  { name: 'control_lot', required: true, description: 'lot' },
                  { name: 'level', required: true, description: 'level' },
                  { name: 'value', required: true, description: 'value' },
                  { name: 'unit', required: true, description: 'unit' },
                  { name: 'run', required: false, description: 'run' },
                  { name: 'comment', required: false, description: 'comment' },
                ],
              }),
            }
          : { status: 200, body: buildSummaryPreview() };
      },
    });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);
    await user.upload(screen.getByLabelText('Choose a file'), csvFile());
    await screen.findByRole('heading', { name: /Match the columns/ });

    await user.click(screen.getByLabelText('Daily values'));

    await waitFor(() => expect(screen.getByLabelText('measured_at', { selector: 'select' })).toBeTruthy());
    expect(selectOf('value').value).toBe('Result');
    expect(selectOf('measured_at').getAttribute('aria-invalid')).toBe('true');
    const previews = api.requests.filter((r) => r.path === '/api/uploads/preview');
    expect(previews.map((r) => formFields(r).kind)).toEqual(['qc-summary', 'qc-values']);
  });

  it('when the preview is refused, then the API message shows and the file can be chosen again', async () => {
    const message = '"november-summary.csv" is saved as UTF-16. Save it as UTF-8 (CSV UTF-8) and try again.';
    mockApi({
      'POST /api/uploads/preview': { status: 400, body: { error: { code: 'bad_request', message } } },
    });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);

    await user.upload(screen.getByLabelText('Choose a file'), csvFile());

    const alert = await screen.findByRole('alert');
    expect(within(alert).getByText(message)).toBeTruthy();
    expect(screen.getByLabelText('Choose a file')).toBeTruthy();
  });

  it('when the same file was sent before, then the duplicate notice from the API shows', async () => {
    const message =
      'This file is identical to "november-summary.csv", uploaded on 2026-11-30 (that upload is stored).';
    mockApi({
      'POST /api/uploads/preview': { status: 200, body: buildSummaryPreview() },
      'POST /api/uploads': {
        status: 202,
        body: {
          id: testUploadId,
          status: 'queued',
          duplicateOf: '9d8c7b6a-5f4e-4d3c-8b2a-1f0e9d8c7b6a',
          message,
        },
      },
      [`GET /api/uploads/${testUploadId}`]: {
        status: 200,
        body: buildUploadDetail({ status: 'processing', progress: 0.1 }),
      },
    });
    const { user } = renderComponent(<UploadJourney onStored={vi.fn()} />);
    await user.upload(screen.getByLabelText('Choose a file'), csvFile());
    await user.click(await screen.findByRole('button', { name: 'Upload and check the file' }));

    expect(await screen.findByText(message)).toBeTruthy();
    expect(screen.getByText('Your lab has sent this same file before')).toBeTruthy();
  });
});
