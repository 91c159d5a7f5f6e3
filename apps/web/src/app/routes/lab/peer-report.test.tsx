import { screen, waitFor, within } from '@testing-library/react';
import { describe, expect, it } from 'vitest';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import {
  buildComment,
  buildDrilldown,
  buildLabReport,
  buildSignoff,
  lotId,
  potassiumProcedureId,
  testLabId,
} from '../../../testing/lab-workspace-data.ts';

const periods = [
  { period: '2026-12', state: 'open', deadline: '2099-01-10T23:59:00.000Z' },
  { period: '2026-11', state: 'open', deadline: '2026-12-10T23:59:00.000Z' },
];
const lab = `/api/labs/${testLabId}`;

function reportTable() {
  return screen.getByRole('table', { name: 'Peer report of November 2026' });
}

function bodyRows() {
  return within(reportTable())
    .getAllByRole('row')
    .filter((row) => row.hasAttribute('data-row-key'));
}

describe('peer report page', () => {
  it('when the analyst ticks "flagged rows only", then only the warning and action rows remain and the URL keeps the filter', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [`GET ${lab}/peer-report`]: { status: 200, body: buildLabReport('2026-11') },
      [`GET ${lab}/comments`]: { status: 200, body: [] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    const { user, router } = renderApp('/lab/peer-report?period=2026-11', { signedInAs: 'analyst' });

    await screen.findByRole('table', { name: 'Peer report of November 2026' });
    expect(screen.getByTestId('report-status').textContent).toMatch(/^Provisional/);
    expect(bodyRows()).toHaveLength(3);

    await user.click(screen.getByLabelText('Flagged rows only (warning or action)'));

    await waitFor(() => expect(bodyRows()).toHaveLength(2));
    expect(bodyRows().map((row) => row.getAttribute('data-severity'))).toEqual(['action', 'warning']);
    expect(within(reportTable()).queryByText('Glucose')).toBeNull();
    expect(screen.getByText(/Showing/).textContent).toBe(
      'Showing 2 of 3 results · 2 flagged. Open a procedure for its charts and comments.',
    );
    expect(router.state.location.search).toContain('flagged=1');
    // The analyst cannot sign; the page says the month waits for the supervisor.
    expect(screen.getByTestId('signoff-open').textContent).toMatch(/Not signed off yet/);
    expect(screen.queryByRole('button', { name: /^Sign off/ })).toBeNull();
  });

  it('when a row’s TEa rule has an absolute part that governs at its level, then the sigma explanation says so', async () => {
    const report = buildLabReport('2026-11');
    const [first, ...rest] = report.rows;
    report.rows = [
      {
        ...first,
        analyte: { ...first.analyte, teaAbsolute: 0.3 },
        tea: { pct: 7.5, governing: 'absolute' },
        sigma: 2.5,
      },
      ...rest,
    ];
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [`GET ${lab}/peer-report`]: { status: 200, body: report },
      [`GET ${lab}/comments`]: { status: 200, body: [] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    renderApp('/lab/peer-report?period=2026-11', { signedInAs: 'analyst' });
    await screen.findByRole('table', { name: 'Peer report of November 2026' });
    const explanation = within(reportTable()).getByText(/the absolute part governs/);
    expect(explanation.textContent).toContain('± 0.3 mmol/L or ± 5.8 %, whichever is greater');
    expect(explanation.textContent).toContain('7.50 % at this level');
  });

  it('when the report is published, then its version shows and a comment shows under its row', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [`GET ${lab}/peer-report`]: {
        status: 200,
        body: buildLabReport('2026-11', { version: 2, publishedAt: '2026-12-13T14:00:00.000Z' }),
      },
      [`GET ${lab}/comments`]: { status: 200, body: [buildComment()] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    renderApp('/lab/peer-report?period=2026-11', { signedInAs: 'analyst' });
    await screen.findByRole('table', { name: 'Peer report of November 2026' });
    expect(screen.getByTestId('report-status').textContent).toMatch(/^Published, version 2/);
    expect(within(reportTable()).getByText(/Recalibrated the potassium electrode/)).toBeTruthy();
    expect(within(reportTable()).getByText('1 comment, charts')).toBeTruthy();
  });

  it('when the supervisor signs the period, then the statement is sent and the period shows as signed', async () => {
    let signoff: ReturnType<typeof buildSignoff> | null = null;
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('supervisor') },
      'GET /api/periods': { status: 200, body: periods },
      [`GET ${lab}/peer-report`]: { status: 200, body: buildLabReport('2026-11') },
      [`GET ${lab}/comments`]: { status: 200, body: [] },
      [`GET ${lab}/signoffs/2026-11`]: () => ({ status: 200, body: { period: '2026-11', signoff } }),
      [`POST ${lab}/signoffs`]: (request) => {
        signoff = buildSignoff({ statement: (request.body as { statement: string }).statement });
        return { status: 201, body: signoff };
      },
    });
    const { user } = renderApp('/lab/peer-report?period=2026-11', { signedInAs: 'supervisor' });
    await screen.findByTestId('signoff-open');
    expect(screen.getByText('2 flagged results have no comment yet.')).toBeTruthy();

    await user.type(screen.getByLabelText('Sign-off statement'), 'Reviewed; potassium bias recalibrated.');
    await user.click(screen.getByRole('button', { name: 'Sign off November 2026' }));
    const dialog = await screen.findByRole('dialog', { name: 'Sign off November 2026?' });
    await user.click(within(dialog).getByRole('button', { name: 'Sign off' }));

    const signed = await screen.findByTestId('signoff-signed');
    expect(signed.textContent).toContain(`Signed off by ${buildMe('supervisor').name}`);
    expect(signed.textContent).toContain('Reviewed; potassium bias recalibrated.');
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({
      period: '2026-11',
      statement: 'Reviewed; potassium bias recalibrated.',
    });
    expect(screen.queryByLabelText('Sign-off statement')).toBeNull();
  });
});

describe('peer report units', () => {
  it('when the analyst chooses conventional units, then the report is asked for in them', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      'GET /api/periods': { status: 200, body: periods },
      [`GET ${lab}/peer-report`]: (request) => ({
        status: 200,
        body: { ...buildLabReport('2026-11'), units: request.query.get('units') ?? 'si' },
      }),
      [`GET ${lab}/comments`]: { status: 200, body: [] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    const { user, router } = renderApp('/lab/peer-report?period=2026-11', { signedInAs: 'analyst' });
    await screen.findByRole('table', { name: 'Peer report of November 2026' });
    expect((screen.getByLabelText('SI') as HTMLInputElement).checked).toBe(true);

    await user.click(screen.getByLabelText('Conventional'));

    await waitFor(() =>
      expect((screen.getByLabelText('Conventional') as HTMLInputElement).checked).toBe(true),
    );
    const reportRequests = api.requests.filter((r) => r.path === `${lab}/peer-report`);
    expect(reportRequests.at(-1)?.query.get('units')).toBe('conventional');
    expect(router.state.location.search).toContain('units=conventional');
  });
});

describe('result details page', () => {
  const detailUrl = `/lab/peer-report/${potassiumProcedureId}/${lotId}/1?period=2026-11`;
  const rowPath = `${lab}/report-rows/${potassiumProcedureId}/${lotId}/1`;

  it('when the period is signed, then existing comments are read-only and a new comment can still be written', async () => {
    const comments = [buildComment()];
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('supervisor') },
      [`GET ${rowPath}`]: { status: 200, body: buildDrilldown() },
      [`GET ${lab}/comments`]: () => ({ status: 200, body: comments }),
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: buildSignoff() } },
      [`POST ${lab}/comments`]: (request) => {
        const body = request.body as { body: string };
        comments.push(
          buildComment({
            id: '8d7c6b5a-4f3e-4d2c-9b1a-0f9e8d7c6b02',
            body: body.body,
            createdAt: '2026-12-03T09:00:00.000Z',
          }),
        );
        return { status: 201, body: comments.at(-1) };
      },
    });
    const { user } = renderApp(detailUrl, { signedInAs: 'supervisor' });

    expect(await screen.findByRole('heading', { name: 'Potassium, level 1', level: 1 })).toBeTruthy();
    expect(screen.getByTestId('signoff-signed').textContent).toContain('read-only');
    const list = screen.getByRole('list', { name: 'Comments' });
    expect(within(list).getByText(/Recalibrated the potassium electrode/)).toBeTruthy();
    // A supervisor could edit or delete before sign-off; not after.
    expect(screen.queryByRole('button', { name: 'Edit' })).toBeNull();
    expect(screen.queryByRole('button', { name: 'Delete' })).toBeNull();

    await user.type(
      screen.getByLabelText('Add a corrective-action comment'),
      'Checked again after sign-off: still within 1 SD.',
    );
    await user.click(screen.getByRole('button', { name: 'Save comment' }));

    await waitFor(() =>
      expect(within(screen.getByRole('list', { name: 'Comments' })).getAllByRole('listitem')).toHaveLength(2),
    );
    expect(api.requests.find((r) => r.method === 'POST')?.body).toEqual({
      period: '2026-11',
      procedureId: potassiumProcedureId,
      controlLotId: lotId,
      level: 1,
      body: 'Checked again after sign-off: still within 1 SD.',
    });
  });

  it('when the target of the control chart is switched to the peer group, then the chart is asked for and drawn against it', async () => {
    const api = mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      [`GET ${rowPath}`]: (request) => {
        const peer = request.query.get('target') === 'peer';
        const drilldown = buildDrilldown();
        return {
          status: 200,
          body: {
            ...drilldown,
            leveyJennings: {
              ...drilldown.leveyJennings,
              target: peer
                ? { kind: 'peer', basis: 'peer-to-date', mean: 4.15, sd: 0.06 }
                : drilldown.leveyJennings.target,
            },
          },
        };
      },
      [`GET ${lab}/comments`]: { status: 200, body: [] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    const { user, router } = renderApp(detailUrl, { signedInAs: 'analyst' });
    const chart = await screen.findByTestId('levey-jennings-level-1');
    expect(chart.textContent).toContain(
      "against your lab's cumulative figures from earlier periods of this lot (mean 4.400",
    );

    await user.click(screen.getByLabelText("The peer group's figures"));

    await waitFor(() =>
      expect(screen.getByTestId('levey-jennings-level-1').textContent).toContain(
        "against the peer group's figures for this lot to date (mean 4.150, SD 0.060)",
      ),
    );
    expect(
      api.requests
        .filter((r) => r.path === rowPath)
        .at(-1)
        ?.query.get('target'),
    ).toBe('peer');
    expect(router.state.location.search).toContain('target=peer');
  });

  it('when the period is not signed, then the author may edit their comment, and the charts show with their tables', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: buildMe('analyst') },
      [`GET ${rowPath}`]: { status: 200, body: buildDrilldown() },
      [`GET ${lab}/comments`]: { status: 200, body: [buildComment()] },
      [`GET ${lab}/signoffs/2026-11`]: { status: 200, body: { period: '2026-11', signoff: null } },
    });
    renderApp(detailUrl, { signedInAs: 'analyst' });
    await screen.findByRole('heading', { name: 'Potassium, level 1', level: 1 });
    expect(screen.getByRole('button', { name: 'Edit' })).toBeTruthy();
    for (const name of [
      'SDI over the last 4 months',
      'CVR over the last 4 months',
      'Lab means at level 1',
      'Two-level SDI plot, levels 1 and 2',
      'Levey-Jennings chart, level 1, November 2026',
      'Measurement uncertainty and its components',
    ]) {
      const section = screen.getByRole('region', { name });
      expect(within(section).getByRole('group', { name })).toBeTruthy();
      expect(within(section).getByRole('table', { name: `${name}: values` })).toBeTruthy();
    }
    const chart = screen.getByTestId('levey-jennings-level-1');
    expect(chart.querySelector('[data-rule-label]')?.textContent).toBe('1-3s');
    expect(screen.getByText(/6 runs: 5 accepted, 0 with a warning,/).textContent).toContain(
      'run R5: 1-2s, 1-3s',
    );
  });
});
