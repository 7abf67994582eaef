import { z } from "zod";

/** Paging query shared by every list: ?page=1&pageSize=50. */
export const PageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
});
export type PageQuery = z.infer<typeof PageQuerySchema>;

/** A page of a list: { items, total }. */
export function pageOf<T extends z.ZodTypeAny>(item: T) {
  return z.object({ items: z.array(item), total: z.number().int() });
}
export type Page<T> = { items: T[]; total: number };

/** Error body of every refusal. */
export const ErrorBodySchema = z.object({
  error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }),
});
export type ErrorBody = z.infer<typeof ErrorBodySchema>;

/** Lengths as numbers in the API; never rounded on the way in. */
export const LengthSchema = z.number().finite();
export const UnitSchema = z.enum(["in", "mm"]);
export const CalendarDateSchema = z.string().regex(/^\d{4}-\d{2}-\d{2}$/, "Use a calendar date YYYY-MM-DD.");
export const InstantSchema = z.string().datetime({ offset: true, message: "Use an ISO 8601 instant with offset." });

/** Optional free text: blank means absent (forms send ""), trimmed, bounded. */
export const optionalText = (max = 200) =>
  z
    .string()
    .trim()
    .max(max)
    .optional()
    .transform((v) => (v ? v : undefined));
