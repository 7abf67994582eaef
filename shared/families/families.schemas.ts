import { z } from "zod";
import { LengthSchema, UnitSchema, optionalText, PageQuerySchema } from "../common/lists.schemas";

/** The `kind` vocabulary of api.md. */
export const TOOL_KINDS = [
  "outside_micrometer",
  "inside_micrometer",
  "telescoping_gauge",
  "small_hole_gauge",
  "feeler_set",
  "dial_indicator",
  "caliper",
  "gauge_block_set",
  "setting_standard",
  "other",
] as const;
export type ToolKind = (typeof TOOL_KINDS)[number];
export const ToolKindSchema = z.enum(TOOL_KINDS);

export const KIND_LABELS: Record<ToolKind, string> = {
  outside_micrometer: "Outside micrometer",
  inside_micrometer: "Inside micrometer",
  telescoping_gauge: "Telescoping gauge set",
  small_hole_gauge: "Small-hole gauge set",
  feeler_set: "Feeler set",
  dial_indicator: "Dial indicator",
  caliper: "Caliper",
  gauge_block_set: "Gauge block set",
  setting_standard: "Setting standard",
  other: "Other",
};

const PositiveLength = LengthSchema.positive("Must be greater than zero.");

/** One check point of a family's plan: a nominal size, optionally with its own permissible error. */
export const CheckPointInputSchema = z.union([
  LengthSchema.nonnegative(),
  z.object({ nominal: LengthSchema.nonnegative(), mpe: PositiveLength.nullish() }),
]);

/** POST /api/families (api.md): name, kind, unit, defaultIntervalDays, mpe?, checkPoints?, usageLimit?; plus resolution and check tolerance. */
export const CreateFamilySchema = z.object({
  name: z.string().trim().min(1, "Name the family.").max(120),
  kind: ToolKindSchema,
  unit: UnitSchema,
  defaultIntervalDays: z.number().int().min(1, "An interval is at least one day.").max(3650),
  /** Maximum permissible error (± half-width) in the family's unit. */
  mpe: PositiveLength.nullish(),
  /** Default check plan: nominal sizes (numbers), or { nominal, mpe } where a point has its own permissible error. */
  checkPoints: z.array(CheckPointInputSchema).max(100).optional(),
  /** Calibrate after this many issues, or at the interval, whichever comes first. */
  usageLimit: z.number().int().min(1).nullish(),
  resolution: PositiveLength.nullish(),
  /** Permissible deviation of an intermediate (pre-use) check; the MPE when absent. */
  checkTolerance: PositiveLength.nullish(),
});
export type CreateFamilyInput = z.input<typeof CreateFamilySchema>;
export type CreateFamily = z.infer<typeof CreateFamilySchema>;

/** PATCH /api/families/:id: any of the create fields. */
export const UpdateFamilySchema = CreateFamilySchema.partial().refine((v) => Object.keys(v).length > 0, "Change at least one field.");
export type UpdateFamily = z.infer<typeof UpdateFamilySchema>;

export const CheckPlanPointSchema = z.object({ nominal: z.number(), mpe: z.number().nullable() });
export type CheckPlanPoint = z.infer<typeof CheckPlanPointSchema>;

export const FamilySchema = z.object({
  id: z.string(),
  name: z.string(),
  kind: ToolKindSchema,
  unit: UnitSchema,
  defaultIntervalDays: z.number().int(),
  mpe: z.number().nullable(),
  /** Nominal sizes of the check plan (api.md shape). */
  checkPoints: z.array(z.number()),
  /** The check plan with each point's own permissible error (null: the family's). */
  checkPlan: z.array(CheckPlanPointSchema),
  usageLimit: z.number().int().nullable(),
  resolution: z.number().nullable(),
  checkTolerance: z.number().nullable(),
  toolCount: z.number().int(),
  createdAt: z.string(),
});
export type Family = z.infer<typeof FamilySchema>;

export const FamilyListQuerySchema = PageQuerySchema.extend({
  q: optionalText(100),
  kind: ToolKindSchema.optional(),
});
export type FamilyListQuery = z.infer<typeof FamilyListQuerySchema>;
