import { z } from 'zod';

export const uuidSchema = z.uuid();
/** A monthly cycle, 'YYYY-MM'. */
export const periodKeySchema = z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'expected a period as YYYY-MM');
export const roles = ['analyst', 'supervisor', 'coordinator'] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;
