import { pinoHttp } from 'pino-http';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { RequestHandler } from 'express';
import { scrubText, type Logger } from '@plumbline/db/logging';

/**
 * One JSON line per request with its request id (the same id the answer carries in X-Request-Id and
 * in error bodies). Only the method, the path without its query string (invitation tokens in paths
 * are scrubbed), the status and the time are logged: never headers, cookies, bodies or query values.
 */
export function requestLog(logger: Logger): RequestHandler {
  return pinoHttp({
    logger,
    genReqId: (_req: IncomingMessage, res: ServerResponse) =>
      (res as ServerResponse & { locals?: { requestId?: string } }).locals?.requestId ?? 'unknown',
    serializers: {
      req: (req: { id: string; method: string; url: string; raw?: { originalUrl?: string } }) => ({
        id: req.id,
        method: req.method,
        path: scrubText((req.raw?.originalUrl ?? req.url).split('?')[0]),
      }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    customLogLevel: (_req, res, err) =>
      err || res.statusCode >= 500 ? 'error' : res.statusCode >= 400 ? 'warn' : 'info',
    // Errors are logged once, by the error handler, with their scrubbed cause.
    customErrorMessage: (_req, res) => `request failed with status ${res.statusCode}`,
  }) as unknown as RequestHandler;
}
