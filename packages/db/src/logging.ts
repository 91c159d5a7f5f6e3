import { AsyncLocalStorage } from 'node:async_hooks';
import { pino, type DestinationStream, type Logger } from 'pino';

export type { Logger };

/** Ids added to every log line written while handling one request or one job. */
export type LogContext = { requestId?: string; uploadId?: string };
export const logContext = new AsyncLocalStorage<LogContext>();

/**
 * Structured JSON logs for the API and the worker. Nothing secret or personal may reach a log line:
 * credentials, passwords, tokens, e-mail addresses and data values are redacted by key, and free text
 * (error messages, which can quote what a client sent or a database row) is scrubbed of quoted values,
 * query parameters, addresses and token-like strings before it is written.
 */
const REDACT_KEYS = [
  'password',
  'passwordHash',
  'token',
  'csrfToken',
  'authorization',
  'cookie',
  'email',
  'value',
  'values',
  'body',
];
const redactPaths = [
  ...REDACT_KEYS,
  ...REDACT_KEYS.map((k) => `*.${k}`),
  'req.headers.authorization',
  'req.headers.cookie',
  'res.headers["set-cookie"]',
];

export function createLogger(
  name: 'api' | 'worker',
  options: { level?: string; destination?: DestinationStream } = {},
): Logger {
  const level =
    options.level ?? process.env.LOG_LEVEL ?? (process.env.NODE_ENV === 'test' ? 'silent' : 'info');
  return pino(
    {
      name,
      level,
      redact: { paths: redactPaths, censor: '[redacted]' },
      serializers: { err: errorForLog },
      mixin: () => ({ ...logContext.getStore() }),
      // Plain messages are scrubbed too: worker messages quote upload outcomes and error texts.
      hooks: {
        logMethod(args, method) {
          method.apply(
            this,
            args.map((a) => (typeof a === 'string' ? scrubText(a) : a)) as Parameters<typeof method>,
          );
        },
      },
    },
    options.destination,
  );
}

const MAX_TEXT = 500;

/** Free text with anything that could carry a secret or a data value replaced. */
export function scrubText(text: string): string {
  return (
    text
      // A failed query's bound parameters (query builders append them to the message).
      .replace(/\bparams:[\s\S]*$/i, 'params: [redacted]')
      // "Key (email)=(someone@example.org) already exists" and similar database details.
      .replace(/=\([^)]*\)/g, '=([redacted])')
      .replace(/Bearer\s+\S+/gi, 'Bearer [redacted]')
      .replace(/\bplb_[A-Za-z0-9_-]+/g, 'plb_[redacted]')
      .replace(/\beyJ[A-Za-z0-9_-]+\.[A-Za-z0-9_-]+\.[A-Za-z0-9_-]*/g, '[redacted-jwt]')
      .replace(/[^\s"'<>()]+@[^\s"'<>()]+\.[A-Za-z]{2,}/g, '[redacted-email]')
      // Quoted values: what a client sent or a cell held.
      .replace(/"[^"\n]*"/g, '"…"')
      .replace(/'[^'\n]*'/g, "'…'")
      .replace(/\/invitations\/[^/?\s]+/g, '/invitations/[redacted]')
      .slice(0, MAX_TEXT)
  );
}

/** An error as logged: its kind, code and scrubbed message and stack, and the same for its cause. */
export function errorForLog(err: unknown, depth = 0): Record<string, unknown> {
  if (!(err instanceof Error)) return { message: scrubText(String(err)) };
  const code = (err as { code?: unknown }).code;
  return {
    type: err.name,
    ...(typeof code === 'string' ? { code } : {}),
    message: scrubText(err.message),
    stack: err.stack ? scrubText(err.stack.split('\n').slice(1, 8).join('\n')) : undefined,
    ...(err.cause && depth < 3 ? { cause: errorForLog(err.cause, depth + 1) } : {}),
  };
}
