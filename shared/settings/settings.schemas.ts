import { z } from "zod";

/** Shop settings an admin can change; defaults apply until they do. */
export const SettingsSchema = z.object({
  shopName: z.string().trim().min(1).max(120),
  shopTimeZone: z.string().min(1),
  dueSoonDays: z.number().int().min(0).max(365),
  reminderCron: z.string().min(9).max(100),
  reminderStages: z.array(z.number().int().min(0).max(365)).min(1).max(10),
  escalationDays: z.number().int().min(1).max(365),
  endOfShift: z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, "Use a time HH:MM."),
  reliabilityTarget: z.number().gt(0.5).lt(1),
  maxIntervalStepFactor: z.number().min(1).max(5),
  windowStartsAtPassingCheck: z.boolean(),
  defaultLengthUnit: z.enum(["in", "mm"]),
  recordRetentionYears: z.number().int().min(1).max(100),
  /** Gauge studies: the appraiser × part interaction is pooled into repeatability when its p-value exceeds this (Bancroft & Han 1983; 0.25 in several statistics packages). */
  studyPoolingAlpha: z.number().gt(0, "Use a probability above 0.").lt(1, "Use a probability below 1."),
  /** r of the decision rule "guarded, shop multiplier": guard band w = r·U (ILAC-G8 §4.2.2). */
  guardBandMultiplier: z.number().min(0).max(3),
  /** Confidence of the interval test's Clopper-Pearson interval (NCSL RP-1 method A3). */
  intervalConfidence: z.number().min(0.8).max(0.999),
  /**
   * Resolution ratio N (N:1): a reading is flagged when its tool's resolution is coarser than 1/N of the item's
   * tolerance. 10:1 is the common rule of thumb ("rule of ten"; common practice, no source binds a shop to it).
   */
  resolutionRatio: z
    .number({ error: "Give the ratio as a number, e.g. 10 for 10:1." })
    .min(1, "A ratio below 1:1 would accept a tool coarser than the tolerance itself.")
    .max(100, "A ratio above 100:1 would flag every tool in the shop."),
});
export type Settings = z.infer<typeof SettingsSchema>;
/** Five cron fields (minute hour day-of-month month weekday); a sixth, seconds, field would mail every second. */
export const ReminderCronSchema = SettingsSchema.shape.reminderCron.refine((v) => v.trim().split(/\s+/).length <= 5, "Use five fields: minute hour day month weekday (no seconds field).");
export const ReminderStagesSchema = SettingsSchema.shape.reminderStages.refine((v) => new Set(v).size === v.length, "Each lead time once: the same stage twice would send the same reminder twice.");

export const UpdateSettingsSchema = SettingsSchema.partial()
  .extend({ reminderCron: ReminderCronSchema.optional(), reminderStages: ReminderStagesSchema.optional() })
  .refine((v) => Object.keys(v).length > 0, "Change at least one setting.");
export type UpdateSettings = z.infer<typeof UpdateSettingsSchema>;

export const DEFAULT_SETTINGS: Omit<Settings, "shopTimeZone"> = {
  shopName: "Tenthwise shop",
  dueSoonDays: 30,
  reminderCron: "0 6 * * *",
  reminderStages: [30, 7, 0],
  escalationDays: 7,
  endOfShift: "17:00",
  reliabilityTarget: 0.95,
  maxIntervalStepFactor: 2,
  windowStartsAtPassingCheck: false,
  defaultLengthUnit: "in",
  recordRetentionYears: 10,
  studyPoolingAlpha: 0.25,
  guardBandMultiplier: 1,
  intervalConfidence: 0.95,
  resolutionRatio: 10,
};
