// Replaces fetch with answers keyed by "METHOD /path" (path without the query string).
import { vi } from 'vitest';

export type RecordedRequest = {
  method: string;
  path: string;
  /** The query string's parameters (handlers are keyed by path only). */
  query: URLSearchParams;
  headers: Headers;
  /** How cookies were sent (the session travels in the API's httpOnly cookie). */
  credentials: RequestCredentials | undefined;
  body: unknown;
};
export type MockAnswer = { status: number; body?: unknown };
type Handler = MockAnswer | ((request: RecordedRequest) => MockAnswer);

export function jsonResponse(answer: MockAnswer): Response {
  if (answer.body === undefined) return new Response(null, { status: answer.status });
  return new Response(JSON.stringify(answer.body), {
    status: answer.status,
    headers: { 'Content-Type': 'application/json' },
  });
}

export function mockApi(handlers: Record<string, Handler>) {
  const requests: RecordedRequest[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init: RequestInit = {}) => {
    const url = new URL(String(input), 'http://localhost');
    const method = (init.method ?? 'GET').toUpperCase();
    const body = typeof init.body === 'string' ? JSON.parse(init.body) : init.body;
    const request: RecordedRequest = {
      method,
      path: url.pathname,
      query: url.searchParams,
      headers: new Headers(init.headers),
      credentials: init.credentials,
      body,
    };
    requests.push(request);
    const handler = handlers[`${method} ${url.pathname}`];
    if (!handler) {
      return jsonResponse({
        status: 501,
        body: {
          error: { code: 'internal', message: `test has no mock answer for ${method} ${url.pathname}` },
        },
      });
    }
    return jsonResponse(typeof handler === 'function' ? handler(request) : handler);
  });
  vi.stubGlobal('fetch', fetchMock);
  return { fetchMock, requests };
}
