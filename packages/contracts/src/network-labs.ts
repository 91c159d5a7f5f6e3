import { z } from 'zod';
import { uuidSchema } from './common.ts';

const reasonSchema = z
  .preprocess(
    (v) => (typeof v === 'string' && v.trim() === '' ? null : v),
    z.string().trim().max(500).nullable(),
  )
  .optional();

// ---------- labs ----------

/** The de-identifying code other labs may see; it should not reveal who the lab is. */
export const labCodeSchema = z
  .string()
  .trim()
  .regex(/^[A-Za-z0-9][A-Za-z0-9-]{1,19}$/, 'use 2 to 20 letters, digits or hyphens');
export const preferredUnitsSchema = z.enum(['si', 'conventional']);

export const labCreateSchema = z.object({
  code: labCodeSchema,
  name: z.string().trim().min(1, 'enter the lab name').max(200),
  preferredUnits: preferredUnitsSchema.optional(),
  reason: reasonSchema,
});
export type LabCreate = z.infer<typeof labCreateSchema>;

export const labUpdateSchema = z.object({
  code: labCodeSchema.optional(),
  name: z.string().trim().min(1, 'enter the lab name').max(200).optional(),
  active: z.boolean().optional(),
  preferredUnits: preferredUnitsSchema.optional(),
  reason: reasonSchema,
});
export type LabUpdate = z.infer<typeof labUpdateSchema>;

export const labDeactivateSchema = z.object({ reason: reasonSchema });

export const labDetailSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  active: z.boolean(),
  preferredUnits: preferredUnitsSchema,
  createdAt: z.string(),
});
export type LabDetail = z.infer<typeof labDetailSchema>;

// ---------- lab users and invitations ----------

/** Roles a lab user may hold; coordinators belong to the network, not to a lab. */
export const labRoleSchema = z.enum(['analyst', 'supervisor']);

export const invitationCreateSchema = z.object({
  email: z.email('enter a valid e-mail address').transform((s) => s.toLowerCase()),
  name: z.string().trim().min(1, 'enter the person’s name').max(200),
  role: labRoleSchema,
});
export type InvitationCreate = z.input<typeof invitationCreateSchema>;

export const invitationCreatedSchema = z.object({
  invitationId: uuidSchema,
  user: z.object({
    id: uuidSchema,
    email: z.string(),
    name: z.string(),
    role: labRoleSchema,
    labId: uuidSchema,
  }),
  expiresAt: z.string(),
  /** Shown to the inviter until invitations are e-mailed. */
  link: z.string(),
});
export type InvitationCreated = z.infer<typeof invitationCreatedSchema>;

export const invitationInfoSchema = z.object({
  email: z.string(),
  name: z.string(),
  labName: z.string(),
  expiresAt: z.string(),
});
export type InvitationInfo = z.infer<typeof invitationInfoSchema>;

/**
 * A new password: at least 12 characters, not only spaces, no composition rules (NIST SP 800-63B,
 * section 3.1.1.2: length and a blocklist instead of character-class rules). The API also refuses
 * passwords on its list of common passwords.
 */
export const newPasswordSchema = z
  .string()
  .min(12, 'use at least 12 characters')
  .max(200, 'use at most 200 characters')
  .refine((value) => value.trim().length > 0, 'a password of only spaces is not allowed');

export const invitationAcceptSchema = z.object({
  token: z.string().min(1, 'the invitation token is missing').max(200),
  password: newPasswordSchema,
});
export type InvitationAccept = z.infer<typeof invitationAcceptSchema>;

export const labUserSchema = z.object({
  id: uuidSchema,
  email: z.string(),
  name: z.string(),
  role: labRoleSchema,
  active: z.boolean(),
  /** Invited and not yet accepted. */
  invitationPending: z.boolean(),
  createdAt: z.string(),
});
export type LabUser = z.infer<typeof labUserSchema>;

export const labUserUpdateSchema = z
  .object({ role: labRoleSchema.optional(), active: z.boolean().optional(), reason: reasonSchema })
  .refine((v) => v.role !== undefined || v.active !== undefined, {
    message: 'give a role or an active flag to change',
  });
export type LabUserUpdate = z.infer<typeof labUserUpdateSchema>;

// ---------- procedures across the network ----------

export const networkProceduresQuerySchema = z.object({
  analyteId: uuidSchema.optional(),
  instrumentModelId: uuidSchema.optional(),
  methodId: uuidSchema.optional(),
  labId: uuidSchema.optional(),
  /** Only procedures that no tier can peer. */
  unpeerable: z.stringbool().optional(),
  /** Labs a tier needs before its figures are published (docs/methods.md: 3, a setting). */
  minLabs: z.coerce.number().int().min(1).max(100).default(3),
  limit: z.coerce.number().int().min(1).max(500).default(100),
  offset: z.coerce.number().int().min(0).default(0),
});
export type NetworkProceduresQuery = z.infer<typeof networkProceduresQuerySchema>;

const ref = z.object({ id: uuidSchema, code: z.string(), name: z.string() });
export const networkProcedureSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  unit: z.string(),
  lab: ref.extend({ active: z.boolean() }),
  analyte: ref,
  instrumentModel: ref,
  method: ref,
  reagent: ref,
  /** Active labs sharing this procedure's key at each tier (the procedure's own lab included). */
  peerable: z.object({
    instrument: z.object({ labs: z.number(), enough: z.boolean() }),
    method: z.object({ labs: z.number(), enough: z.boolean() }),
    analyte: z.object({ labs: z.number(), enough: z.boolean() }),
  }),
  unpeerable: z.boolean(),
});
export type NetworkProcedure = z.infer<typeof networkProcedureSchema>;

export const networkProceduresPageSchema = z.object({
  total: z.number(),
  minLabs: z.number(),
  items: z.array(networkProcedureSchema),
});
export type NetworkProceduresPage = z.infer<typeof networkProceduresPageSchema>;
