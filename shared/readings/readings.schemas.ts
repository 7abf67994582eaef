import { z } from "zod";
import { LengthSchema, UnitSchema, InstantSchema, optionalText } from "../common/lists.schemas";
import { EXPANSION_COEFFICIENTS, type MaterialKey } from "../common/units";
import { TOOL_STATUSES } from "../tools/tool-status";

/** Flag names on readings (api.md). */
export const READING_FLAGS = [
  "tool_overdue",
  "tool_out_of_tolerance",
  "tool_quarantined",
  "tool_never_calibrated",
  "resolution_too_coarse",
  "outside_tool_range",
  "not_in_custody",
  "suspect",
  "override",
  "gauge_study_not_acceptable",
] as const;
export type ReadingFlag = (typeof READING_FLAGS)[number];

export const FLAG_LABELS: Record<ReadingFlag, string> = {
  tool_overdue: "Tool was overdue",
  tool_out_of_tolerance: "Tool was out of tolerance",
  tool_quarantined: "Tool was quarantined",
  tool_never_calibrated: "Tool was never calibrated",
  resolution_too_coarse: "Tool resolution coarser than a tenth of the tolerance",
  outside_tool_range: "Value outside the tool's range",
  not_in_custody: "Tool not issued to the reader",
  suspect: "Suspect: the tool was later found out of tolerance",
  override: "Accepted by quality despite an unusable tool",
  gauge_study_not_acceptable: "The tool family's latest gauge study on this characteristic is not acceptable",
};

export const MATERIAL_KEYS = Object.keys(EXPANSION_COEFFICIENTS) as [MaterialKey, ...MaterialKey[]];
export const MaterialSchema = z.enum(MATERIAL_KEYS);

const TempSchema = z.number().finite().min(-40, "Below −40 °C is not a shop temperature.").max(80, "Above 80 °C is not a shop temperature.");
const AssetTagSchema = z.string().trim().min(1, "Scan or type the tool's tag.").max(40);

/**
 * A reading on a check sheet. A size item sends `values` (one per direction) and the tools used (a bore read
 * through a telescoping gauge names the gauge and the micrometer); a feeler item sends the set and goEntered /
 * noGoEntered; a visual item sends visualResult and finding. Values are kept exactly as typed.
 */
export const CreateReadingSchema = z.object({
  itemKey: z.string().trim().min(1, "Choose the item.").max(60),
  index: z.number().int().min(1).max(64).optional(),
  values: z.array(LengthSchema).max(12).optional(),
  toolAssetTags: z.array(AssetTagSchema).max(4).default([]),
  temperatureC: TempSchema.optional(),
  toolTemperatureC: TempSchema.optional(),
  partMaterial: MaterialSchema.optional(),
  goEntered: z.boolean().optional(),
  noGoEntered: z.boolean().optional(),
  visualResult: z.enum(["serviceable", "reject"]).optional(),
  finding: optionalText(1000),
  /** Quality (or admin) accepting a reading despite an unusable tool, with the reason. */
  override: z.object({ reason: z.string().trim().min(5, "Say why the reading is accepted anyway.").max(500) }).optional(),
});
export type CreateReadingInput = z.input<typeof CreateReadingSchema>;
export type CreateReading = z.output<typeof CreateReadingSchema>;

/** A correction: a new reading for the same item and index that supersedes the old one, with the reason. */
export const SupersedeReadingSchema = CreateReadingSchema.omit({ itemKey: true, index: true }).extend({
  reason: z.string().trim().min(5, "Say why the reading is corrected.").max(500),
});
export type SupersedeReadingInput = z.input<typeof SupersedeReadingSchema>;

export const LeafSchema = z.object({ id: z.string().uuid(), label: z.string(), thickness: z.number() });

/** The answer to recording a reading (api.md). */
export const ReadingResultSchema = z.object({
  id: z.string().uuid(),
  size: z.number().optional(),
  outOfRound: z.number().optional(),
  clearance: z.number().optional(),
  goLeaf: LeafSchema.optional(),
  noGoLeaf: LeafSchema.optional(),
  verdict: z.enum(["within_limits", "outside_limits", "pending"]),
  flags: z.array(z.string()),
});
export type ReadingResult = z.infer<typeof ReadingResultSchema>;

export const ReadingToolSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  kind: z.string(),
  unit: UnitSchema,
  /** Status and calibration due date at the instant of the reading. */
  statusAtReading: z.enum(TOOL_STATUSES),
  dueAtReading: z.string().nullable(),
});

const PersonRef = z.object({ id: z.string(), name: z.string() });

export const ReadingViewSchema = z.object({
  id: z.string().uuid(),
  itemKey: z.string(),
  index: z.number().int(),
  /** As typed, in the unit of the tool read (`unit`). */
  values: z.array(z.number()),
  unit: UnitSchema,
  /** In the table's unit. */
  size: z.number().nullable(),
  outOfRound: z.number().nullable(),
  correction: z
    .object({ correction: z.number(), correctedSize: z.number(), partMaterial: MaterialSchema, temperatureC: z.number(), toolTemperatureC: z.number() })
    .nullable(),
  goEntered: z.boolean().nullable(),
  noGoEntered: z.boolean().nullable(),
  goLeaf: LeafSchema.nullable(),
  noGoLeaf: LeafSchema.nullable(),
  visualResult: z.enum(["serviceable", "reject"]).nullable(),
  finding: z.string().nullable(),
  verdict: z.enum(["within_limits", "outside_limits", "pending"]),
  verdictText: z.string(),
  flags: z.array(z.string()),
  tools: z.array(ReadingToolSchema),
  takenBy: PersonRef.nullable(),
  takenAt: InstantSchema,
  temperatureC: z.number().nullable(),
  toolTemperatureC: z.number().nullable(),
  partMaterial: MaterialSchema.nullable(),
  supersedesId: z.string().nullable(),
  supersedeReason: z.string().nullable(),
  supersededById: z.string().nullable(),
  overrideReason: z.string().nullable(),
  overrideBy: PersonRef.nullable(),
});
export type ReadingView = z.infer<typeof ReadingViewSchema>;

/** Feeler leaves to use for an item, from a set (GET /api/jobs/:id/feeler-leaves). */
export const FeelerLeavesQuerySchema = z.object({ itemKey: z.string().trim().min(1).max(60), setTag: AssetTagSchema });
export const FeelerLeavesSchema = z.object({ goLeaf: LeafSchema.nullable(), noGoLeaf: LeafSchema.nullable(), unit: UnitSchema });
export type FeelerLeaves = z.infer<typeof FeelerLeavesSchema>;
