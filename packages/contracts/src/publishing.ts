import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';
import { periodDetailSchema } from './cycles.ts';

// Publishing a period freezes a versioned snapshot of its peer statistics; republishing (with a
// reason) adds the next version and leaves the earlier ones readable.

export const publishRequestSchema = z.object({
  reason: z
    .preprocess(
      (v) => (typeof v === 'string' && v.trim() === '' ? null : v),
      z.string().trim().max(500).nullable(),
    )
    .optional(),
});
export type PublishRequest = z.infer<typeof publishRequestSchema>;

export const republishRequestSchema = z.object({
  reason: z
    .string({ message: 'say why the period is published again' })
    .trim()
    .min(1, 'say why the period is published again')
    .max(500),
});
export type RepublishRequest = z.infer<typeof republishRequestSchema>;

export const publicationSchema = z.object({
  period: periodKeySchema,
  version: z.number().int(),
  reason: z.string().nullable(),
  publishedAt: z.string(),
  publishedBy: z.object({ id: uuidSchema, name: z.string() }).nullable(),
  /** Peer-statistics rows frozen in this version (period and lot-to-date figures). */
  statistics: z.number().int(),
});
export type Publication = z.infer<typeof publicationSchema>;
export const publicationListSchema = z.array(publicationSchema);

export const publishResultSchema = z.object({ period: periodDetailSchema, publication: publicationSchema });
export type PublishResult = z.infer<typeof publishResultSchema>;
