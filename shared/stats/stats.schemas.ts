import { z } from "zod";
import { TOOL_STATUSES } from "../tools/tool-status";
import { CalendarDateSchema } from "../common/lists.schemas";

const StatusSchema = z.enum(TOOL_STATUSES);

/** GET /api/stats/overview (api.md): counts by derived status, due within 30 days, overdue, open investigations. */
export const StatsOverviewSchema = z.object({
  byStatus: z.record(StatusSchema, z.number().int()),
  dueWithin30Days: z.number().int(),
  overdue: z.number().int(),
  openInvestigations: z.number().int(),
});
export type StatsOverview = z.infer<typeof StatsOverviewSchema>;

/** One family's end-of-period in-tolerance rate: recalibrations found in tolerance as found (first calibrations excluded). */
export const FamilyRateSchema = z.object({
  familyId: z.string(),
  name: z.string(),
  recalibrations: z.number().int(),
  inTolerance: z.number().int(),
  rate: z.number().nullable(),
});
export type FamilyRate = z.infer<typeof FamilyRateSchema>;

/** Tools falling due in one week (Monday to Sunday would depend on locale: weeks here start today). */
export const DueWeekSchema = z.object({ weekStart: CalendarDateSchema, weekEnd: CalendarDateSchema, count: z.number().int() });

/** GET /api/stats/dashboard: the overview plus what the quality and crib dashboards show. */
export const StatsDashboardSchema = StatsOverviewSchema.extend({
  today: CalendarDateSchema,
  totalTools: z.number().int(),
  dueWithin7Days: z.number().int(),
  notReturned: z.number().int(),
  sheetsAwaitingSignature: z.number().int(),
  investigationsNeedingDisposition: z.number().int(),
  dueByWeek: z.array(DueWeekSchema),
  inToleranceRateByFamily: z.array(FamilyRateSchema),
});
export type StatsDashboard = z.infer<typeof StatsDashboardSchema>;

export const MyToolSchema = z.object({
  assetTag: z.string(),
  description: z.string(),
  status: StatusSchema,
  usable: z.boolean(),
  dueAt: CalendarDateSchema.nullable(),
  daysToDue: z.number().int().nullable(),
  reasons: z.array(z.string()),
  /** issued: checked out to me; personal: my own tool. */
  relation: z.enum(["issued", "personal"]),
  dueBackAt: z.string().nullable(),
});
export type MyTool = z.infer<typeof MyToolSchema>;

export const JobSummarySchema = z.object({
  id: z.string(),
  engineSerial: z.string(),
  engineModel: z.string(),
  workOrder: z.string().nullable(),
  openedAt: z.string(),
  readings: z.number().int(),
  lastReadingAt: z.string().nullable(),
});
export type JobSummary = z.infer<typeof JobSummarySchema>;

/** GET /api/stats/mine: the signed-in person's tools (issued and personal) and open jobs. */
export const StatsMineSchema = z.object({
  tools: z.array(MyToolSchema),
  openJobs: z.array(JobSummarySchema),
});
export type StatsMine = z.infer<typeof StatsMineSchema>;

export const InvestigationSummarySchema = z.object({
  id: z.string(),
  toolAssetTag: z.string().nullable(),
  standardAssetTag: z.string().nullable(),
  trigger: z.string(),
  openedAt: z.string(),
  itemsAwaitingDisposition: z.number().int(),
});

/** GET /api/stats/inspection: sheets awaiting signature and investigations needing a disposition. */
export const StatsInspectionSchema = z.object({
  /** The oldest 50 of each; the totals count them all. */
  sheetsAwaitingSignature: z.array(JobSummarySchema),
  sheetsTotal: z.number().int(),
  investigationsNeedingDisposition: z.array(InvestigationSummarySchema),
  investigationsTotal: z.number().int(),
});
export type StatsInspection = z.infer<typeof StatsInspectionSchema>;
