import type { ErrorRequestHandler, RequestHandler } from 'express';
import { randomUUID } from 'node:crypto';
import { isDatabaseUnavailable } from '@plumbline/db';
import { AppError } from '../errors/app-error.ts';
import { clientErrorOf } from './client-errors.ts';
import { logContext } from '@plumbline/db/logging';

/** Seconds a client is asked to wait while the database is away (a restart takes a few). */
export const RETRY_AFTER_SECONDS = 5;

export const requestId: RequestHandler = (req, res, next) => {
  const id = randomUUID();
  res.locals.requestId = id;
  res.setHeader('x-request-id', id);
  // Everything this request logs or enqueues carries its id (see the ingest queue and the worker).
  logContext.run({ requestId: id }, next);
};

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new AppError('not_found', `No API route for ${req.method} ${req.path}.`));
};

/** The central error handler: every failure leaves as `{ error: { code, message, details?, requestId } }`. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const requestIdValue = res.locals.requestId as string | undefined;
  let appError: AppError;
  if (err instanceof AppError) {
    appError = err;
  } else if (err?.type === 'entity.parse.failed') {
    appError = new AppError('bad_request', 'The request body is not valid JSON.');
  } else if (err?.type === 'entity.too.large') {
    appError = new AppError('payload_too_large', 'The request body is too large.');
  } else if (isDatabaseUnavailable(err)) {
    // Not the request's fault and not a bug: the database is restarting or unreachable. The pool
    // reconnects by itself, so the client is told when to try again.
    req.log.warn({ err }, 'database unavailable');
    appError = new AppError(
      'service_unavailable',
      'The service is briefly unavailable (its database is restarting). Try again in a few seconds.',
    );
  } else if (clientErrorOf(err)) {
    appError = clientErrorOf(err) as AppError;
  } else {
    // Never leak internals; log the cause with the request id so operators can find it.
    req.log.error({ err }, 'request failed with an unexpected error');
    appError = new AppError('internal', 'Something went wrong on our side. Please try again.');
  }
  if (res.headersSent) return;
  if (appError.status === 503) res.setHeader('Retry-After', String(RETRY_AFTER_SECONDS));
  res.status(appError.status).json({
    error: {
      code: appError.code,
      message: appError.message,
      ...(appError.details !== undefined ? { details: appError.details } : {}),
      ...(requestIdValue ? { requestId: requestIdValue } : {}),
    },
  });
};
