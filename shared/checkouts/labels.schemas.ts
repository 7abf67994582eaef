import { z } from "zod";
import { AssetTagSchema } from "./checkouts.schemas";
import { TOOL_STATUSES } from "../tools/tool-status";

// ?assetTags=A&assetTags=B or ?assetTags=A,B — both read the same.
const tagList = z
  .union([z.string(), z.array(z.string())])
  .transform((v) => (Array.isArray(v) ? v : [v]).flatMap((s) => s.split(",")).map((s) => s.trim()).filter(Boolean))
  .pipe(z.array(AssetTagSchema).min(1, "Choose at least one tool.").max(300));

/** Calibration labels for a sheet of 30-up 2-5/8 × 1 in label stock; `skip` leaves used positions on a partly used sheet. */
export const CalibrationLabelsQuerySchema = z.object({
  assetTags: tagList,
  skip: z.coerce.number().int().min(0).max(29).default(0),
});
export type CalibrationLabelsQuery = z.input<typeof CalibrationLabelsQuerySchema>;

export const DoNotUseQuerySchema = z.object({ assetTag: AssetTagSchema });

export const CalibrationLabelSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  status: z.enum(TOOL_STATUSES),
  usable: z.boolean(),
  calibratedAt: z.string().nullable(),
  dueAt: z.string().nullable(),
  calibratedBy: z.string().nullable(),
  statusUrl: z.string(),
  /** PNG of the QR code as a data: URL, for the print view. */
  qr: z.string(),
});
export type CalibrationLabel = z.infer<typeof CalibrationLabelSchema>;
export const CalibrationLabelsSchema = z.object({ items: z.array(CalibrationLabelSchema) });

export const DoNotUseTagSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  status: z.enum(TOOL_STATUSES),
  reasons: z.array(z.string()),
  taggedOn: z.string(),
  taggedBy: z.string(),
  statusUrl: z.string(),
  qr: z.string(),
});
export type DoNotUseTag = z.infer<typeof DoNotUseTagSchema>;
