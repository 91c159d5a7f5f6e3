import type { z } from 'zod';
import { AppError } from '../errors/app-error.ts';

/** Parses request input with a contract schema; failures become 400 with field errors. */
export function parseInput<S extends z.ZodType>(schema: S, input: unknown, where = 'body'): z.infer<S> {
  const result = schema.safeParse(input);
  if (result.success) return result.data;
  const details = result.error.issues.map((issue) => ({
    path: issue.path.length ? issue.path.join('.') : where,
    message: issue.message,
  }));
  throw new AppError(
    'bad_request',
    `Invalid ${where}: ${details.map((d) => `${d.path}: ${d.message}`).join('; ')}`,
    details,
  );
}
