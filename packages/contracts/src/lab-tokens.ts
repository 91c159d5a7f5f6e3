import { z } from 'zod';
import { uuidSchema } from './common.ts';

/** POST /api/labs/:labId/api-tokens */
export const labApiTokenCreateSchema = z.object({
  name: z.string().trim().min(1, 'give the token a name, e.g. the system that will use it').max(100),
});
export type LabApiTokenCreate = z.infer<typeof labApiTokenCreateSchema>;

/** A token as listed: never the secret, only its first characters. */
export const labApiTokenSchema = z.object({
  id: uuidSchema,
  labId: uuidSchema,
  name: z.string(),
  prefix: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export const labApiTokenListSchema = z.array(labApiTokenSchema);
export type LabApiToken = z.infer<typeof labApiTokenSchema>;

/** The response to creating a token: the only time the secret is shown. */
export const labApiTokenCreatedSchema = labApiTokenSchema.extend({ token: z.string() });
export type LabApiTokenCreated = z.infer<typeof labApiTokenCreatedSchema>;
