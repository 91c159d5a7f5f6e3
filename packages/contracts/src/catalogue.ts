import { z } from 'zod';
import { periodKeySchema, uuidSchema } from './common.ts';

/** GET /api/labs */
export const labListItemSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  name: z.string(),
  active: z.boolean(),
});
export const labListSchema = z.array(labListItemSchema);
export type LabListItem = z.infer<typeof labListItemSchema>;

/** GET /api/periods */
export const periodSchema = z.object({
  period: periodKeySchema,
  state: z.enum(['open', 'closed', 'published']),
  deadline: z.string(),
});
export const periodListSchema = z.array(periodSchema);
export type Period = z.infer<typeof periodSchema>;

const namedSchema = z.object({ id: uuidSchema, name: z.string() });

/** GET /api/labs/:labId/procedures */
export const procedureSchema = z.object({
  id: uuidSchema,
  code: z.string(),
  analyte: z.object({ code: z.string(), name: z.string(), loinc: z.string().nullable(), unit: z.string() }),
  instrumentModel: namedSchema,
  method: namedSchema,
  reagent: namedSchema,
  /** The unit the lab reports in; values are stored in the analyte's unit. */
  unit: z.string(),
});
export const procedureListSchema = z.array(procedureSchema);
export type Procedure = z.infer<typeof procedureSchema>;

/** GET /api/control-lots */
export const controlLotSummarySchema = z.object({
  id: uuidSchema,
  lotNumber: z.string(),
  material: namedSchema,
  levels: z.array(z.number().int()),
  expiresOn: z.string(),
});
export const controlLotSummaryListSchema = z.array(controlLotSummarySchema);
export type ControlLotSummary = z.infer<typeof controlLotSummarySchema>;
