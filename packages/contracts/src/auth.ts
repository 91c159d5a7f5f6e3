import { z } from 'zod';
import { roleSchema, uuidSchema } from './common.ts';

export const loginRequestSchema = z.object({
  email: z.email('enter a valid e-mail address').transform((s) => s.toLowerCase()),
  password: z.string().min(1, 'enter your password'),
});
export type LoginRequest = z.input<typeof loginRequestSchema>;

export const userSchema = z.object({
  id: uuidSchema,
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  labId: uuidSchema.nullable(),
});
export type User = z.infer<typeof userSchema>;

/** The session token itself is set as an httpOnly cookie and never appears in the body. */
export const loginResponseSchema = z.object({
  expiresAt: z.string().optional(),
  user: userSchema,
});
export type LoginResponse = z.infer<typeof loginResponseSchema>;

export const meResponseSchema = userSchema.extend({
  lab: z.object({ id: uuidSchema, code: z.string(), name: z.string() }).nullable(),
});
export type MeResponse = z.infer<typeof meResponseSchema>;

export const healthResponseSchema = z.object({
  status: z.enum(['ok', 'degraded']),
  db: z.enum(['ok', 'down']),
  redis: z.enum(['ok', 'down']),
});
export type HealthResponse = z.infer<typeof healthResponseSchema>;
