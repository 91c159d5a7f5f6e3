import { AppError } from '../errors/app-error.ts';

const TOO_LONG_TO_ECHO = 80;

/**
 * Errors raised below our own code that are the client's fault, as the AppError to answer with; null
 * for anything else. Covers path parameters that cannot be decoded (Express marks them 400), other
 * 4xx errors of Express and its body parsers, and values PostgreSQL refuses as data (SQLSTATE class 22:
 * invalid text for a uuid, a number out of range, a string too long) that slipped past validation.
 */
export function clientErrorOf(err: unknown): AppError | null {
  if (typeof err !== 'object' || err === null) return null;
  const e = err as { status?: unknown; statusCode?: unknown; message?: unknown; cause?: unknown };
  const status = typeof e.status === 'number' ? e.status : e.statusCode;
  if (typeof status === 'number' && status >= 400 && status < 500) {
    if (status === 413) return new AppError('payload_too_large', 'The request body is too large.');
    if (status === 415)
      return new AppError('unsupported_media_type', 'This content type is not accepted here.');
    const message = typeof e.message === 'string' ? e.message : 'Bad request';
    return new AppError('bad_request', `The request is malformed: ${shorten(message)}.`);
  }
  const code = sqlState(err);
  if (code?.startsWith('22')) {
    return new AppError(
      'bad_request',
      'A value in the request is not valid for its field (wrong type, format or length).',
    );
  }
  return null;
}

/** The SQLSTATE of a PostgreSQL error, also when a query builder wrapped it (as `cause`). */
function sqlState(err: unknown): string | null {
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 4; depth += 1) {
    const code = (e as { code?: unknown }).code;
    if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
    e = (e as { cause?: unknown }).cause;
  }
  return null;
}

const shorten = (text: string) =>
  (text.length > TOO_LONG_TO_ECHO ? `${text.slice(0, TOO_LONG_TO_ECHO)}…` : text).replace(/\.$/, '');
