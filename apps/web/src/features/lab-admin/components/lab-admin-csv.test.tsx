import { screen, waitFor } from '@testing-library/react';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { parse } from 'csv-parse/sync';
import { labApiTokenSchema } from '@plumbline/contracts';
import { buildMe } from '../../../testing/data.ts';
import { mockApi } from '../../../testing/mock-api.ts';
import { buildLabUser } from '../../../testing/network-data.ts';
import { renderApp } from '../../../testing/render-app.tsx';
import { testLabId } from '../../../testing/lab-workspace-data.ts';

// OWASP "CSV Injection": text beginning with = + - @ tab or CR is run as a formula by spreadsheets;
// the shared writer (csvCell in @plumbline/contracts) prepends an apostrophe. Names are invented.
const HYPERLINK = '=HYPERLINK("http://attacker.invalid","Click")';
const me = buildMe('supervisor');
const planted = buildLabUser({
  id: '4b3a2c1d-0e9f-4a8b-9c7d-6e5f4a3b2c09',
  name: HYPERLINK,
  email: 'analyst@kestrel-vale.example',
});
const self = buildLabUser({ id: me.id, name: me.name, email: me.email, role: 'supervisor' });
const token = labApiTokenSchema.parse({
  id: '6c5b4a39-0000-4000-8000-000000000001',
  labId: testLabId,
  name: '@SUM(1+1)',
  prefix: 'plb_inve',
  createdAt: '2026-12-01T10:00:00.000Z',
  lastUsedAt: null,
  revokedAt: null,
});

afterEach(() => vi.restoreAllMocks());

/** Every file the page saves, in order. */
function captureDownloads(): Blob[] {
  const saved: Blob[] = [];
  vi.spyOn(URL, 'createObjectURL').mockImplementation((blob) => {
    saved.push(blob as Blob);
    return 'blob:test';
  });
  vi.spyOn(URL, 'revokeObjectURL').mockImplementation(() => {});
  return saved;
}

describe('lab administration CSV downloads', () => {
  it('when a user name or token name looks like a formula, then the downloaded CSV neutralises it', async () => {
    mockApi({
      'GET /api/me': { status: 200, body: me },
      [`GET /api/labs/${testLabId}/users`]: { status: 200, body: [self, planted] },
      [`GET /api/labs/${testLabId}/api-tokens`]: { status: 200, body: [token] },
    });
    const saved = captureDownloads();
    const { user } = renderApp('/lab/administration', { signedInAs: 'supervisor' });
    await screen.findAllByText(HYPERLINK);
    const buttons = screen.getAllByRole('button', { name: 'Download CSV' });
    await waitFor(() => expect(buttons.every((b) => !b.hasAttribute('disabled'))).toBe(true));
    for (const button of buttons) await user.click(button);
    expect(saved).toHaveLength(2);

    const texts = await Promise.all(saved.map((blob) => blob.text()));
    const cells = texts.flatMap((text) => (parse(text) as string[][]).flat());
    expect(cells).toContain(`'${HYPERLINK}`);
    expect(cells).toContain("'@SUM(1+1)");
    expect(cells.filter((cell) => /^[=+\-@\t\r]/.test(cell))).toEqual([]);
  });
});
