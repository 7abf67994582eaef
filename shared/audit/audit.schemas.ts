import { z } from "zod";
import { PageQuerySchema, pageOf } from "../common/lists.schemas";

const dateOrInstant = z.union([
  z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a date YYYY-MM-DD or an ISO 8601 instant."),
  z.string().datetime({ offset: true, message: "Use a date YYYY-MM-DD or an ISO 8601 instant." }),
]);

/** GET /api/audit filters: who, which record, when (from and to inclusive; a date means that whole day in the shop's zone). */
export const AuditQuerySchema = PageQuerySchema.extend({
  actorId: z.string().uuid("Pick a person from the list.").optional(),
  entityType: z.string().trim().min(1).max(60).optional(),
  entityId: z.string().trim().min(1).max(200).optional(),
  action: z.string().trim().min(1).max(80).optional(),
  from: dateOrInstant.optional(),
  to: dateOrInstant.optional(),
  /** Keyset paging: the nextCursor of the page before (same filters); the page then starts after its last line. */
  after: z
    .string()
    .trim()
    .regex(/^\d{1,20}_\d{1,20}$/, "Not a cursor from this list.")
    .optional(),
});
export type AuditQuery = z.infer<typeof AuditQuerySchema>;

export const AuditEventSchema = z.object({
  id: z.number().int(),
  at: z.string(),
  actorId: z.string().nullable(),
  actorName: z.string().nullable(),
  action: z.string(),
  entityType: z.string(),
  entityId: z.string(),
  /** The action and record type in words (shared/audit/labels.ts). */
  actionLabel: z.string(),
  entityTypeLabel: z.string(),
  /** The record as people know it (tag, engine serial, name) and its page; null when it no longer exists. */
  record: z.object({ title: z.string(), path: z.string().nullable() }).nullable(),
  before: z.unknown(),
  after: z.unknown(),
});
export type AuditEvent = z.infer<typeof AuditEventSchema>;

/** The most lines the trail counts for its total; past it the answer says "more than" (totalCapped). */
export const AUDIT_TOTAL_CAP = 10_000;

/**
 * A page of the trail. A trail of millions of lines is not counted whole on each page: `total` counts up to
 * AUDIT_TOTAL_CAP lines, and `totalCapped` says there are more. `nextCursor` asks for the page after this one by
 * ?after= (null on the last page), at the same cost however deep.
 */
export const AuditPageSchema = pageOf(AuditEventSchema).extend({ totalCapped: z.boolean(), nextCursor: z.string().nullable() });
export type AuditPage = z.infer<typeof AuditPageSchema>;

/** Distinct record types and actions on the trail, for the filter lists. */
export const AuditFacetsSchema = z.object({
  entityTypes: z.array(z.string()),
  actions: z.array(z.string()),
  /** Each record type with its words, for the filter list. */
  entityTypeOptions: z.array(z.object({ value: z.string(), label: z.string() })),
});
