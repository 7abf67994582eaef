import { z } from "zod";
import { CalendarDateSchema, PageQuerySchema, optionalText } from "../common/lists.schemas";

/** POST /api/labs: an outside calibration lab and its accreditation. */
export const CreateLabSchema = z.object({
  name: z.string().trim().min(1, "Name the lab.").max(120),
  accreditationBody: optionalText(120),
  accreditationNumber: optionalText(60),
  scope: optionalText(500),
  accreditationExpiresAt: CalendarDateSchema.optional(),
  contact: optionalText(300),
});
export type CreateLabInput = z.input<typeof CreateLabSchema>;
export type CreateLab = z.infer<typeof CreateLabSchema>;

/** valid; expiring_soon (within the shop's warning window); expired; unknown (no expiry recorded). */
export const AccreditationStateSchema = z.enum(["valid", "expiring_soon", "expired", "unknown"]);
export type AccreditationState = z.infer<typeof AccreditationStateSchema>;

export const LabSchema = z.object({
  id: z.string(),
  name: z.string(),
  accreditationBody: z.string().nullable(),
  accreditationNumber: z.string().nullable(),
  scope: z.string().nullable(),
  accreditationExpiresAt: CalendarDateSchema.nullable(),
  contact: z.string().nullable(),
  /** Accreditation as of today in the shop's zone. */
  accreditation: AccreditationStateSchema,
  createdAt: z.string(),
});
export type Lab = z.infer<typeof LabSchema>;

export const LabListQuerySchema = PageQuerySchema.extend({ q: optionalText(100) });
export type LabListQuery = z.infer<typeof LabListQuerySchema>;
