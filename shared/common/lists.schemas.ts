import { z } from "zod";
import { isCalendarDate } from "./dates";

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

/**
 * Lengths as numbers in the API; never rounded on the way in. Bounded to what a shop measures: at most a
 * million units either way (a kilometre in mm), and nothing smaller than a billionth of the unit except
 * zero — 1e308 or 1e-320 is a slip (or a probe), and would overflow the computations behind a verdict.
 */
export const LengthSchema = z
  .number()
  .finite()
  .min(-1e6, "A length this large is not a measurement; check the unit.")
  .max(1e6, "A length this large is not a measurement; check the unit.")
  .refine((v) => v === 0 || Math.abs(v) >= 1e-9, "A length this small is below any tool's resolution; enter 0 or check the unit.");
export const UnitSchema = z.enum(["in", "mm"]);

/** Years the register accepts in dates and instants: its records and their due dates, with room either side. */
const YEAR_MIN = 1900;
const YEAR_MAX = 2199;
const yearInRange = (v: string) => {
  const y = Number(v.slice(0, 4));
  return y >= YEAR_MIN && y <= YEAR_MAX;
};
export const CalendarDateSchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Use a calendar date YYYY-MM-DD.")
  // abort: a date refused here is not refused again by a schema that refines it further.
  .refine(isCalendarDate, { message: "Not a calendar date (check the month and day).", abort: true })
  .refine(yearInRange, { message: `Use a date between ${YEAR_MIN} and ${YEAR_MAX}.`, abort: true });
export const InstantSchema = z
  .string()
  .datetime({ offset: true, message: "Use an ISO 8601 instant with offset." })
  .refine((v) => yearInRange(v) && !Number.isNaN(Date.parse(v)), `Use a date between ${YEAR_MIN} and ${YEAR_MAX}.`);

/** Optional free text: blank means absent (forms send ""), trimmed, bounded. */
export const optionalText = (max = 200) =>
  z
    .string()
    .trim()
    .max(max)
    .optional()
    .transform((v) => (v ? v : undefined));
