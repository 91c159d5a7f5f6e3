// Turns an API error into what a form shows: field errors beside their fields (the API's
// `details: [{ path, message }]`, e.g. `loinc` or `levels.0.level`) and one sentence for the rest.
import { z } from 'zod';
import type { FieldValues, Path, UseFormSetError } from 'react-hook-form';
import { fieldErrorSchema, type FieldError } from '@plumbline/contracts';
import { isApiError } from './api-client.ts';

const fieldErrorListSchema = z.array(fieldErrorSchema);

/** The field errors an API error carries, or an empty list. */
export function fieldErrorsOf(error: unknown): FieldError[] {
  if (!isApiError(error)) return [];
  const parsed = fieldErrorListSchema.safeParse(error.details);
  return parsed.success ? parsed.data : [];
}

/**
 * Puts each field error the form has a field for beside that field; returns the errors it could not
 * place (a path the form does not show), so the caller can show them in the form's alert.
 */
export function applyServerFieldErrors<T extends FieldValues>(
  error: unknown,
  setError: UseFormSetError<T>,
  fieldNames: readonly string[],
): FieldError[] {
  const unplaced: FieldError[] = [];
  let focused = false;
  for (const fieldError of fieldErrorsOf(error)) {
    const known = fieldNames.some(
      (name) => fieldError.path === name || fieldError.path.startsWith(`${name}.`),
    );
    if (!known) {
      unplaced.push(fieldError);
      continue;
    }
    setError(
      fieldError.path as Path<T>,
      { type: 'server', message: fieldError.message },
      { shouldFocus: !focused },
    );
    focused = true;
  }
  return unplaced;
}

/** One sentence for a failed request, for an alert or a toast. */
export function errorMessage(
  error: unknown,
  fallback = 'That did not work for an unexpected reason. Try again.',
): string {
  return isApiError(error) ? error.message : fallback;
}

/**
 * The sentence above a form after a failed save: when every field error the API named sits beside
 * its field, a pointer to them (not the API's technical summary); otherwise the API's message.
 */
export function formAlertMessage(error: unknown, fieldNames: readonly string[]): string {
  const fieldErrors = fieldErrorsOf(error);
  const allPlaced =
    fieldErrors.length > 0 &&
    fieldErrors.every((e) => fieldNames.some((name) => e.path === name || e.path.startsWith(`${name}.`)));
  return allPlaced ? 'Some fields need attention: see the messages beside them.' : errorMessage(error);
}
