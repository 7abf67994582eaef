import { z } from "zod";
import { InstantSchema, LengthSchema, optionalText, PageQuerySchema } from "../common/lists.schemas";
import { TOOL_STATUSES } from "../tools/tool-status";

export const AssetTagSchema = z.string().trim().min(1, "Scan or type the asset tag.").max(64);

/**
 * Issue a tool from the crib. The person is named by e-mail (api.md), or by id,
 * or by the badge code scanned at the counter; at least one is needed.
 */
export const IssueToolSchema = z
  .object({
    assetTag: AssetTagSchema,
    userEmail: z.string().trim().toLowerCase().email("Enter the person's e-mail address.").optional(),
    userId: z.string().uuid().optional(),
    badgeCode: z.string().trim().min(1).max(64).optional(),
    dueBackAt: InstantSchema.optional(),
    workOrder: optionalText(64),
    engineSerial: optionalText(64),
    /** The attendant confirms a reference-only tool is wanted for reference, never for acceptance readings. */
    referenceUseOnly: z.boolean().optional(),
  })
  .refine((v) => v.userEmail || v.userId || v.badgeCode, { message: "Choose the person the tool is issued to (name, e-mail or badge).", path: ["userEmail"] });
export type IssueToolInput = z.input<typeof IssueToolSchema>;

/** A zero (or setting) check made when the tool comes back, recorded as an intermediate check. */
export const ZeroCheckSchema = z.object({
  nominal: LengthSchema,
  reading: LengthSchema,
  standardId: z.string().uuid().optional(),
});
export type ZeroCheckInput = z.infer<typeof ZeroCheckSchema>;

/** Return a tool to the crib; damaged quarantines it at once. A photo may come along as multipart field `photo`. */
export const ReturnToolSchema = z.object({
  condition: z.enum(["ok", "damaged"]),
  note: optionalText(1000),
  zeroCheck: ZeroCheckSchema.optional(),
});
export type ReturnToolInput = z.input<typeof ReturnToolSchema>;

/** A yes/no query parameter written "true" or "false". */
export const BoolTextSchema = z.enum(["true", "false"]).transform((v) => v === "true");
const boolText = BoolTextSchema;

export const CheckoutListQuerySchema = PageQuerySchema.extend({
  open: boolText.optional(),
  userId: z.string().uuid().optional(),
  /** Open and not back by the time it was expected (end of shift by default). */
  overdue: boolText.optional(),
  assetTag: z.string().trim().max(64).optional(),
  q: z.string().trim().max(100).optional(),
  sort: z.enum(["dueBackAt", "-dueBackAt", "issuedAt", "-issuedAt", "assetTag", "-assetTag", "person", "-person"]).optional(),
});
export type CheckoutListQuery = Omit<z.input<typeof CheckoutListQuerySchema>, "page" | "pageSize"> & { page?: number; pageSize?: number };

const ToolStatusSchema = z.enum(TOOL_STATUSES);

export const CheckoutSchema = z.object({
  id: z.string(),
  tool: z.object({ id: z.string(), assetTag: z.string(), description: z.string(), unit: z.enum(["in", "mm"]), rangeMin: z.number(), rangeMax: z.number(), status: ToolStatusSchema, usable: z.boolean(), dueAt: z.string().nullable() }),
  person: z.object({ id: z.string(), name: z.string(), email: z.string() }),
  issuedAt: z.string(),
  issuedBy: z.string().nullable(),
  dueBackAt: z.string(),
  workOrder: z.string().nullable(),
  engineSerial: z.string().nullable(),
  returnedAt: z.string().nullable(),
  returnedBy: z.string().nullable(),
  returnCondition: z.enum(["ok", "damaged"]).nullable(),
  returnNote: z.string().nullable(),
  hasPhoto: z.boolean(),
  /** Still out after the time it was expected back. */
  notBackInTime: z.boolean(),
});
export type Checkout = z.infer<typeof CheckoutSchema>;

export const IssueResultSchema = CheckoutSchema.extend({ warnings: z.array(z.string()) });
export type IssueResult = z.infer<typeof IssueResultSchema>;

export const ReturnResultSchema = CheckoutSchema.extend({
  quarantined: z.boolean(),
  zeroCheck: z.object({ id: z.string(), passed: z.boolean(), deviation: z.number(), tolerance: z.number() }).nullable(),
  investigationId: z.string().nullable(),
  messages: z.array(z.string()),
});
export type ReturnResult = z.infer<typeof ReturnResultSchema>;

/** A tool someone holds: issued to them, or their own (personal) tool. */
export const MyToolSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  relation: z.enum(["issued", "own"]),
  status: ToolStatusSchema,
  usable: z.boolean(),
  reasons: z.array(z.string()),
  dueAt: z.string().nullable(),
  checkoutId: z.string().nullable(),
  since: z.string().nullable(),
  dueBackAt: z.string().nullable(),
});
export type MyTool = z.infer<typeof MyToolSchema>;
export const MyToolsSchema = z.object({ items: z.array(MyToolSchema) });

/** Mark a tool lost or found again; the reason goes into its history. */
export const LostFoundSchema = z.object({ reason: z.string().trim().min(3, "Give a reason (at least 3 characters).").max(500) });
export type LostFoundInput = z.infer<typeof LostFoundSchema>;

export const LostFoundResultSchema = z.object({
  assetTag: z.string(),
  lifecycle: z.enum(["active", "lost"]),
  status: ToolStatusSchema,
  reasons: z.array(z.string()),
  /** Who had it when it was lost (their checkout stays open), or whose checkout closed when it was found. */
  custodian: z.object({ name: z.string(), email: z.string(), checkoutId: z.string() }).nullable(),
  investigationId: z.string().nullable(),
  messages: z.array(z.string()),
});
export type LostFoundResult = z.infer<typeof LostFoundResultSchema>;
