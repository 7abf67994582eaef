import { z } from "zod";
import { dec } from "../common/decimal";
import { LengthSchema, UnitSchema, InstantSchema, optionalText } from "../common/lists.schemas";
import { TOOL_KINDS } from "../families/families.schemas";

export const LIMIT_ITEM_KINDS = ["visual", "journal", "bore", "clearance", "feeler", "taper"] as const;
export type LimitItemKind = (typeof LIMIT_ITEM_KINDS)[number];
export const LimitItemKindSchema = z.enum(LIMIT_ITEM_KINDS);

export const LIMIT_ITEM_KIND_LABELS: Record<LimitItemKind, string> = {
  visual: "Visual (serviceable / reject)",
  journal: "Journal (outside size)",
  bore: "Bore (inside size)",
  clearance: "Clearance (bore − journal)",
  feeler: "Feeler gap (go / no-go)",
  taper: "Taper between two stations",
};

const optionalLength = LengthSchema.nullish().transform((v) => (v == null ? undefined : v));

/**
 * A part's linear expansion coefficient per kelvin (steel 11.5 × 10⁻⁶, aluminium alloys 21.5–23.4 × 10⁻⁶: NIST J. Res.;
 * Callister App. B). With a part temperature on a reading, sizes are judged at 20 °C (ISO 1).
 */
export const ExpansionSchema = z
  .number()
  .finite()
  .positive("An expansion coefficient is above zero.")
  .max(0.0001, "Give the coefficient per kelvin, e.g. 0.0000115 for steel.")
  .nullish()
  .transform((v) => (v == null ? undefined : v));

/** One line of a limits table. For journal and bore items min/max bound the size; for clearance and feeler items the clearance. */
export const LimitItemInputSchema = z.object({
  key: z
    .string()
    .trim()
    .min(1, "Give the item a key.")
    .max(60)
    .regex(/^[A-Za-z0-9_.-]+$/, "Use letters, digits, dots, dashes or underscores in a key."),
  label: z.string().trim().min(1, "Name the item.").max(160),
  section: optionalText(120),
  kind: LimitItemKindSchema,
  min: optionalLength,
  max: optionalLength,
  serviceableMin: optionalLength,
  serviceableMax: optionalLength,
  boreKey: optionalText(60),
  journalKey: optionalText(60),
  /** The least number of values a size reading needs (two positions 90° apart, FAA-H-8083-32). */
  directions: z.number().int().min(1, "At least one direction.").max(12).default(2),
  /** How many of the item the engine has (per cylinder, per valve…). */
  repeat: z.number().int().min(1, "An engine has at least one of each item.").max(64).default(1),
  toolKinds: z.array(z.enum(TOOL_KINDS)).max(10).optional(),
  /** Clearance limits are diametral unless the table says radial; radial = diametral / 2 (common practice). */
  radial: z.boolean().default(false),
  /** Journal or bore: the largest out-of-round (largest − smallest reading at one station) allowed. */
  outOfRoundMax: LengthSchema.min(0, "An out-of-round limit is zero or more.").nullish().transform((v) => (v == null ? undefined : v)),
  /** Taper item: the two size items (stations) whose difference it limits, e.g. top and bottom of ring travel. */
  stationKeys: z.array(z.string().trim().min(1).max(60)).length(2, "A taper is between two stations.").optional(),
  /** Journal or bore: the part's expansion coefficient per kelvin (overrides the table's). */
  expansionPerK: ExpansionSchema,
  note: optionalText(500),
});
export type LimitItemInput = z.input<typeof LimitItemInputSchema>;
export type LimitItem = z.output<typeof LimitItemInputSchema>;

const lte = (a: number | undefined, b: number | undefined) => a == null || b == null || dec(a).lte(dec(b));

/** The rules between items: unique keys, clearance pairs that exist, limits in order. */
function checkItems(items: LimitItem[], ctx: z.RefinementCtx) {
  const byKey = new Map<string, LimitItem>();
  items.forEach((it, i) => {
    if (byKey.has(it.key)) ctx.addIssue({ code: "custom", path: ["items", i, "key"], message: `Key "${it.key}" is used twice; keys must be unique.` });
    byKey.set(it.key, it);
  });
  items.forEach((it, i) => {
    const at = (field: string, message: string) => ctx.addIssue({ code: "custom", path: ["items", i, field], message });
    if (!lte(it.min, it.max)) at("max", "The maximum must not be below the minimum.");
    if (!lte(it.serviceableMin, it.serviceableMax)) at("serviceableMax", "The serviceable maximum must not be below the serviceable minimum.");
    if (it.kind === "visual") {
      if (it.min != null || it.max != null || it.serviceableMin != null || it.serviceableMax != null) at("kind", "A visual item has no numeric limits.");
      return;
    }
    if (it.kind === "journal" || it.kind === "bore" || it.kind === "feeler") {
      if (it.min == null || it.max == null) at(it.min == null ? "min" : "max", "Give both the new minimum and maximum.");
    } else if (it.kind === "clearance" && it.min == null && it.max == null) at("max", "Give at least a minimum or a maximum clearance.");
    if (it.kind === "feeler" && it.min != null && it.min <= 0) at("min", "A feeler gap's minimum must be above zero (the go leaf is at or above it).");
    if (it.radial && it.kind !== "clearance") at("radial", "Only a clearance item's limits can be radial.");
    if (it.outOfRoundMax != null && it.kind !== "journal" && it.kind !== "bore") at("outOfRoundMax", "Only a journal or bore item has an out-of-round limit.");
    if (it.expansionPerK != null && it.kind !== "journal" && it.kind !== "bore") at("expansionPerK", "Only a journal or bore item is corrected to 20 °C.");
    if (it.kind === "taper") {
      if (it.min != null || it.serviceableMin != null) at("min", "A taper has a maximum only.");
      if (it.max == null) at("max", "Give the largest taper allowed.");
      else if (it.max < 0) at("max", "A taper limit is zero or more.");
      const keys = it.stationKeys ?? [];
      const stations = keys.map((k) => byKey.get(k));
      if (keys.length !== 2 || keys[0] === keys[1]) at("stationKeys", "Name two different stations (journal or bore items) of this table.");
      else if (stations.some((s) => !s || (s.kind !== "journal" && s.kind !== "bore"))) at("stationKeys", "Both stations must be journal or bore items of this table.");
      else if (stations[0]!.kind !== stations[1]!.kind) at("stationKeys", "Both stations must be the same kind (two bores, or two journals).");
      else if (stations.some((s) => it.repeat > s!.repeat)) at("repeat", "A taper cannot repeat more often than its stations.");
      if (it.boreKey || it.journalKey) at("boreKey", "Only a clearance item names a bore and a journal.");
      return;
    } else if (it.stationKeys?.length) at("stationKeys", "Only a taper item names stations.");
    if (it.kind === "clearance") {
      const bore = it.boreKey ? byKey.get(it.boreKey) : undefined;
      const journal = it.journalKey ? byKey.get(it.journalKey) : undefined;
      if (!bore || bore.kind !== "bore") at("boreKey", "Name an existing bore item of this table.");
      if (!journal || journal.kind !== "journal") at("journalKey", "Name an existing journal item of this table.");
      if (bore && journal && (it.repeat > bore.repeat || it.repeat > journal.repeat)) {
        at("repeat", "A clearance cannot repeat more often than its bore and journal items.");
      }
    } else if (it.boreKey || it.journalKey) at("boreKey", "Only a clearance item names a bore and a journal.");
  });
}

/** Create a limits table (and a revision: the same shape). */
export const CreateLimitTableSchema = z
  .object({
    name: z.string().trim().min(1, "Name the table.").max(160),
    engineModel: z.string().trim().min(1, "Name the engine model.").max(120),
    unit: UnitSchema,
    sourceDocument: z.string().trim().min(1, "Name the manufacturer's document the limits come from.").max(200),
    sourceRevision: z.string().trim().min(1, "Give the document's revision.").max(60),
    /** Invented values for the demonstration; shown as demo everywhere. */
    isDemo: z.boolean().default(false),
    /** The expansion coefficient of the table's parts, per kelvin, where an item does not give its own. */
    expansionPerK: ExpansionSchema,
    items: z.array(LimitItemInputSchema).min(1, "A table needs at least one item.").max(500),
  })
  .superRefine((t, ctx) => checkItems(t.items, ctx));
export type CreateLimitTableInput = z.input<typeof CreateLimitTableSchema>;
export type CreateLimitTable = z.output<typeof CreateLimitTableSchema>;

export const LimitItemSchema = z.object({
  key: z.string(),
  label: z.string(),
  section: z.string().nullable(),
  kind: LimitItemKindSchema,
  min: z.number().nullable(),
  max: z.number().nullable(),
  serviceableMin: z.number().nullable(),
  serviceableMax: z.number().nullable(),
  boreKey: z.string().nullable(),
  journalKey: z.string().nullable(),
  directions: z.number().int(),
  repeat: z.number().int(),
  toolKinds: z.array(z.string()).nullable(),
  radial: z.boolean(),
  outOfRoundMax: z.number().nullable(),
  stationKeys: z.array(z.string()).nullable(),
  expansionPerK: z.number().nullable(),
  note: z.string().nullable(),
});
export type LimitItemView = z.infer<typeof LimitItemSchema>;

export const LimitTableSummarySchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  engineModel: z.string(),
  unit: UnitSchema,
  sourceDocument: z.string(),
  sourceRevision: z.string(),
  version: z.number().int(),
  supersedesId: z.string().uuid().nullable(),
  /** The newer revision, when this one has been revised (jobs started on it keep it). */
  supersededById: z.string().uuid().nullable(),
  isDemo: z.boolean(),
  expansionPerK: z.number().nullable(),
  createdAt: InstantSchema,
  createdBy: z.object({ id: z.string(), name: z.string() }).nullable(),
  itemCount: z.number().int(),
});
export type LimitTableSummary = z.infer<typeof LimitTableSummarySchema>;

export const LimitTableSchema = LimitTableSummarySchema.extend({ items: z.array(LimitItemSchema) });
export type LimitTable = z.infer<typeof LimitTableSchema>;

export const LimitTableListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  q: z.string().trim().max(100).optional(),
  engineModel: z.string().trim().max(120).optional(),
  /** Only tables not yet revised (the ones a new job should use). */
  current: z.enum(["true", "false"]).transform((v) => v === "true").optional(),
  sort: z.enum(["name", "-name", "engineModel", "-engineModel", "createdAt", "-createdAt"]).default("engineModel"),
});
export type LimitTableListQuery = z.input<typeof LimitTableListQuerySchema>;

/** The sentence every limits table carries. */
export const VERIFY_NOTICE = "Verify against the manufacturer's current data before use.";
