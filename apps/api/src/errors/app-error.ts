import type { ErrorCode } from '@plumbline/contracts';

const statusByCode: Record<ErrorCode, number> = {
  bad_request: 400,
  validation_failed: 422,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  payload_too_large: 413,
  unsupported_media_type: 415,
  too_many_requests: 429,
  service_unavailable: 503,
  internal: 500,
};

/** The one error family: services throw these; the central handler turns them into error bodies. */
export class AppError extends Error {
  readonly code: ErrorCode;
  readonly status: number;
  readonly details?: unknown;

  constructor(code: ErrorCode, message: string, details?: unknown) {
    super(message);
    this.name = 'AppError';
    this.code = code;
    this.status = statusByCode[code];
    this.details = details;
  }
}

export const badRequest = (message: string, details?: unknown) =>
  new AppError('bad_request', message, details);
export const validationFailed = (message: string, details?: unknown) =>
  new AppError('validation_failed', message, details);
export const unauthenticated = (message = 'Sign in to continue.') => new AppError('unauthenticated', message);
export const forbidden = (message = 'Your role does not allow this action.') =>
  new AppError('forbidden', message);
export const notFound = (what = 'Resource') => new AppError('not_found', `${what} not found.`);
export const conflict = (message: string, details?: unknown) => new AppError('conflict', message, details);
