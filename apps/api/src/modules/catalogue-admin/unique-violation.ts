/**
 * The name of the unique constraint a failed insert or update broke, or null when the failure is
 * something else. Drizzle wraps the driver's error, so the chain of causes is searched.
 */
export function uniqueViolation(err: unknown): string | null {
  let current: unknown = err;
  for (let depth = 0; current && typeof current === 'object' && depth < 5; depth++) {
    const candidate = current as { code?: unknown; constraint?: unknown; cause?: unknown };
    if (candidate.code === '23505')
      return typeof candidate.constraint === 'string' ? candidate.constraint : '';
    current = candidate.cause;
  }
  return null;
}
