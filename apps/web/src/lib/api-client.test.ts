import { describe, expect, it, vi } from 'vitest';
import { meResponseSchema } from '@plumbline/contracts';
import { buildMe, buildSession } from '../testing/data.ts';
import { mockApi } from '../testing/mock-api.ts';
import { ApiError, apiRequest } from './api-client.ts';
import { getSession, getSessionState, startSession } from './session.ts';

async function caught(promise: Promise<unknown>): Promise<ApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
  throw new Error('expected the request to fail');
}

describe('api client', () => {
  it('when a session exists, then no token is sent from script (the cookie carries it) and the body is parsed with the schema', async () => {
    startSession(buildSession('supervisor'));
    const api = mockApi({ 'GET /api/me': { status: 200, body: buildMe('supervisor') } });

    const me = await apiRequest('/me', { schema: meResponseSchema });

    expect(me.lab?.code).toBe('L07');
    expect(api.requests[0]?.headers.has('Authorization')).toBe(false);
    expect(api.requests[0]?.headers.has('X-CSRF-Token')).toBe(false);
  });

  it('when a state-changing request is sent, then it carries the CSRF token from its cookie', async () => {
    document.cookie = 'plumbline_csrf=csrf-value-1';
    try {
      const api = mockApi({ 'POST /api/things': { status: 204 } });
      await apiRequest('/things', { method: 'POST', body: {} });
      expect(api.requests[0]?.headers.get('X-CSRF-Token')).toBe('csrf-value-1');
    } finally {
      document.cookie = 'plumbline_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT';
    }
  });

  it('when the API answers with an error body, then an ApiError carries its code, message, details and status', async () => {
    const details = [{ path: 'period', message: 'expected a period as YYYY-MM' }];
    mockApi({
      'POST /api/things': {
        status: 400,
        body: {
          error: {
            code: 'validation_failed',
            message: 'The request is not valid.',
            details,
            requestId: 'r-1',
          },
        },
      },
    });

    const error = await caught(apiRequest('/things', { method: 'POST', body: { period: '2026-13' } }));

    expect(error.code).toBe('validation_failed');
    expect(error.message).toBe('The request is not valid.');
    expect(error.details).toEqual(details);
    expect(error.status).toBe(400);
    expect(error.requestId).toBe('r-1');
  });

  it('when an error response has no error body, then the code follows the HTTP status', async () => {
    mockApi({ 'GET /api/me': { status: 503, body: '<html>bad gateway</html>' } });

    const error = await caught(apiRequest('/me'));

    expect(error.code).toBe('service_unavailable');
    expect(error.status).toBe(503);
  });

  it('when a success body does not match the schema, then the client refuses it', async () => {
    mockApi({ 'GET /api/me': { status: 200, body: { id: 'not-a-uuid' } } });

    const error = await caught(apiRequest('/me', { schema: meResponseSchema }));

    expect(error.code).toBe('internal');
    expect(Array.isArray(error.details)).toBe(true);
  });

  it('when the network fails, then the error says the service cannot be reached', async () => {
    vi.stubGlobal('fetch', async () => {
      throw new TypeError('Failed to fetch');
    });

    const error = await caught(apiRequest('/me'));

    expect(error.code).toBe('service_unavailable');
    expect(error.status).toBe(0);
  });

  it('when a signed-in request gets 401, then the session ends as expired', async () => {
    startSession(buildSession('analyst'));
    mockApi({
      'GET /api/me': { status: 401, body: { error: { code: 'unauthenticated', message: 'Expired.' } } },
    });

    const error = await caught(apiRequest('/me', { schema: meResponseSchema }));

    expect(error.status).toBe(401);
    expect(getSession()).toBeNull();
    expect(getSessionState().endReason).toBe('expired');
  });

  it('when the stored session has passed its expiry time, then it is not used', async () => {
    startSession({ ...buildSession('analyst'), expiresAt: new Date(Date.now() - 1000).toISOString() });
    const api = mockApi({ 'GET /api/health': { status: 200, body: {} } });

    await apiRequest('/health');

    expect(api.requests[0]?.headers.has('Authorization')).toBe(false);
    expect(getSessionState().endReason).toBe('expired');
  });
});
