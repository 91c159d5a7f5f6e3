// The one way the web app talks to the API: the session travels in the API's httpOnly cookie, state
// changes carry the CSRF token, every response is parsed with the contract's zod schema, and every
// failure becomes an ApiError carrying the wire error code.
import type { z } from 'zod';
import { errorBodySchema, type ErrorCode } from '@plumbline/contracts';
import { env } from '../config/env.ts';
import { endSession, getSession } from './session.ts';

export class ApiError extends Error {
  readonly code: ErrorCode;
  /** HTTP status; 0 when the service could not be reached at all. */
  readonly status: number;
  readonly details: unknown;
  readonly requestId: string | undefined;

  constructor(input: {
    code: ErrorCode;
    message: string;
    status: number;
    details?: unknown;
    requestId?: string;
  }) {
    super(input.message);
    this.name = 'ApiError';
    this.code = input.code;
    this.status = input.status;
    this.details = input.details;
    this.requestId = input.requestId;
  }
}

export function isApiError(error: unknown): error is ApiError {
  return error instanceof ApiError;
}

type Method = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
type QueryValue = string | number | boolean | null | undefined;

export type ApiRequestOptions<Schema extends z.ZodType | undefined> = {
  method?: Method;
  /** A plain value is sent as JSON; FormData is sent as multipart (file uploads). */
  body?: unknown;
  query?: Record<string, QueryValue>;
  /** Schema of a successful response body; leave it out for 204 No Content. */
  schema?: Schema;
  signal?: AbortSignal;
};

type ResponseOf<Schema> = Schema extends z.ZodType ? z.output<Schema> : undefined;

function buildUrl(path: string, query: Record<string, QueryValue> | undefined): string {
  const url = `${env.apiBaseUrl}${path}`;
  if (!query) return url;
  const search = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== null) search.set(key, String(value));
  }
  const text = search.toString();
  return text ? `${url}?${text}` : url;
}

/** The error code to use when a failed response has no readable error body (e.g. a proxy's HTML page). */
function codeForStatus(status: number): ErrorCode {
  if (status === 400) return 'bad_request';
  if (status === 401) return 'unauthenticated';
  if (status === 403) return 'forbidden';
  if (status === 404) return 'not_found';
  if (status === 409) return 'conflict';
  if (status === 413) return 'payload_too_large';
  if (status === 415) return 'unsupported_media_type';
  if (status === 422) return 'validation_failed';
  if (status === 429) return 'too_many_requests';
  if (status === 502 || status === 503 || status === 504) return 'service_unavailable';
  return 'internal';
}

/** The CSRF token the API set as a readable cookie at sign-in (double submit), if any. */
function csrfToken(): string | null {
  if (typeof document === 'undefined') return null;
  const match = /(?:^|;\s*)plumbline_csrf=([^;]+)/.exec(document.cookie);
  return match ? decodeURIComponent(match[1]) : null;
}

async function readJson(response: Response): Promise<unknown> {
  const text = await response.text();
  if (!text) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}

async function toApiError(response: Response): Promise<ApiError> {
  const parsed = errorBodySchema.safeParse(await readJson(response));
  if (parsed.success) {
    return new ApiError({ ...parsed.data.error, status: response.status });
  }
  return new ApiError({
    code: codeForStatus(response.status),
    message: `The Plumbline service answered with HTTP ${response.status} and no readable error message.`,
    status: response.status,
  });
}

export async function apiRequest<Schema extends z.ZodType | undefined = undefined>(
  path: string,
  options: ApiRequestOptions<Schema> = {},
): Promise<ResponseOf<Schema>> {
  const session = getSession();
  const method = options.method ?? 'GET';
  const headers = new Headers({ Accept: 'application/json' });
  const csrf = csrfToken();
  if (method !== 'GET' && csrf) headers.set('X-CSRF-Token', csrf);

  let body: BodyInit | undefined;
  if (options.body instanceof FormData) {
    body = options.body; // the browser sets the multipart boundary itself
  } else if (options.body !== undefined) {
    headers.set('Content-Type', 'application/json');
    body = JSON.stringify(options.body);
  }

  let response: Response;
  try {
    response = await fetch(buildUrl(path, options.query), {
      method,
      headers,
      body,
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError({
      code: 'service_unavailable',
      message: 'The Plumbline service cannot be reached. Check your connection and try again.',
      status: 0,
    });
  }

  if (!response.ok) {
    const error = await toApiError(response);
    // A token the API no longer accepts: end the session; the session guard sends the user to sign-in.
    if (response.status === 401 && session) endSession('expired');
    throw error;
  }

  if (!options.schema) return undefined as ResponseOf<Schema>;

  const parsed = options.schema.safeParse(await readJson(response));
  if (!parsed.success) {
    throw new ApiError({
      code: 'internal',
      message: `The response from ${path} did not have the expected shape.`,
      status: response.status,
      details: parsed.error.issues,
    });
  }
  return parsed.data as ResponseOf<Schema>;
}

/**
 * A file from the API (e.g. a CSV export), fetched so failures can be shown in the page. Failures
 * become an ApiError exactly as for apiRequest.
 */
export async function apiDownload(
  path: string,
  options: { query?: Record<string, QueryValue>; signal?: AbortSignal } = {},
): Promise<{ blob: Blob; filename: string | null }> {
  const session = getSession();
  let response: Response;
  try {
    response = await fetch(buildUrl(path, options.query), {
      credentials: 'same-origin',
      signal: options.signal,
    });
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error;
    throw new ApiError({
      code: 'service_unavailable',
      message: 'The Plumbline service cannot be reached. Check your connection and try again.',
      status: 0,
    });
  }
  if (!response.ok) {
    const error = await toApiError(response);
    if (response.status === 401 && session) endSession('expired');
    throw error;
  }
  const disposition = response.headers.get('Content-Disposition') ?? '';
  const filename = /filename="?([^";]+)"?/i.exec(disposition)?.[1] ?? null;
  return { blob: await response.blob(), filename };
}

/** Hands a downloaded file to the browser as if the user had clicked a download link. */
export function saveFile(blob: Blob, filename: string): void {
  const url = URL.createObjectURL(blob);
  const link = document.createElement('a');
  link.href = url;
  link.download = filename;
  document.body.append(link);
  link.click();
  link.remove();
  // Revoke after the click has been handled, or some browsers cancel the download.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}
