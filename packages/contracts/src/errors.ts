import { z } from 'zod';

/** The finite list of error codes that cross the wire. */
export const errorCodes = [
  'bad_request',
  'validation_failed',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'gone',
  'payload_too_large',
  'unsupported_media_type',
  'too_many_requests',
  'service_unavailable',
  'internal',
] as const;
export const errorCodeSchema = z.enum(errorCodes);
export type ErrorCode = z.infer<typeof errorCodeSchema>;

/** Every error response: `{ error: { code, message, details?, requestId? } }`. */
export const errorBodySchema = z.object({
  error: z.object({
    code: errorCodeSchema,
    message: z.string(),
    details: z.unknown().optional(),
    requestId: z.string().optional(),
  }),
});
export type ErrorBody = z.infer<typeof errorBodySchema>;

/** Field errors carried in `details` of a `validation_failed` error. */
export const fieldErrorSchema = z.object({ path: z.string(), message: z.string() });
export type FieldError = z.infer<typeof fieldErrorSchema>;
