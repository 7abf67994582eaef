// Which reminders a tool calls for on a given day, and who gets them (product.md, "Reminders").
// Pure: the server feeds it the derived status of each tool; the reminder log makes each one exactly once.

/** The digests a person may receive; escalations cannot be turned off. */
export const DIGESTS = ["myTools", "crib", "quality", "escalations"] as const;
export type DigestKey = (typeof DIGESTS)[number];

/** Reminder kinds other than the lead-time stages ("due_30", "due_7", "due_0"…). */
export type ReminderStage = `due_${number}` | "overdue" | "usage_low" | "usage_limit" | "not_returned" | "escalation";

/** What the planner needs to know about one tool at the instant of the run. */
export interface ToolForReminders {
  toolId: string;
  status: string;
  /** Calendar date the calibration runs out (shop time zone), or null when none counts. */
  dueAt: string | null;
  daysToDue: number | null;
  usageLimit: number | null;
  usesRemaining: number | null;
  ownerUserId: string | null;
  custodian: { userId: string; dueBackAt: string } | null;
}

export interface PlannedReminder {
  toolId: string;
  /** The cycle's date: the calibration due date, or for a tool not returned the day it was due back. */
  dueAt: string;
  stage: ReminderStage;
  recipientId: string;
  digest: DigestKey;
}

export interface PlanInput {
  tools: ToolForReminders[];
  /** ISO instant of the run. */
  at: string;
  /** Calendar date of the run in the shop's time zone. */
  today: string;
  /** Converts an instant to the shop's calendar date. */
  dayOf: (instant: string) => string;
  stages: number[];
  escalationDays: number;
  cribIds: string[];
  qualityIds: string[];
}

// Statuses under which a tool is in service and so must be recalled before it runs out.
// Tools away at a lab, quarantined, out of tolerance, inactive, lost or retired are already out of use.
const RECALLED: ReadonlySet<string> = new Set(["in_calibration", "due_soon", "limited", "overdue"]);

/** The lead-time stage a tool is in: the most urgent stage already reached (null before the first, or once overdue). */
export function dueStage(daysToDue: number, stages: readonly number[]): number | null {
  if (daysToDue < 0) return null;
  const reached = stages.filter((s) => daysToDue <= s);
  return reached.length ? Math.min(...reached) : null;
}

/** True in the last tenth of a usage limit (common practice, no source; the same window the status derivation warns in). */
export function usageRunningLow(usesRemaining: number, usageLimit: number): boolean {
  return usesRemaining * 10 <= usageLimit;
}

/** For an overdue tool: overdue for escalationDays or more, or overdue in someone's hands, and quality must step in (common practice, no source). */
export function needsEscalation(daysOverdue: number, escalationDays: number, issued: boolean): boolean {
  return issued || daysOverdue >= escalationDays;
}

/** The key a reminder is sent once under (the reminder log's unique key): tool|cycle date|stage|recipient. */
export const reminderKey = (r: Pick<PlannedReminder, "toolId" | "dueAt" | "stage" | "recipientId">) => `${r.toolId}|${r.dueAt}|${r.stage}|${r.recipientId}`;

/** Every reminder due at this run, one per (tool, cycle date, stage, recipient). */
export function planReminders(input: PlanInput): PlannedReminder[] {
  return [...planReminderMap(input).values()];
}

/** The same, by reminderKey: a caller comparing with the reminders already sent reuses the keys built here. */
export function planReminderMap(input: PlanInput): Map<string, PlannedReminder> {
  const out = new Map<string, PlannedReminder>();
  const add = (r: PlannedReminder) => {
    const key = reminderKey(r);
    // A person reached twice (a crib attendant holding the tool) keeps their own copy, not the crib's.
    if (!out.has(key)) out.set(key, r);
  };

  for (const t of input.tools) {
    const holders = [t.custodian?.userId, t.ownerUserId].filter((x): x is string => !!x);
    const toHolders = (dueAt: string, stage: ReminderStage) => holders.forEach((id) => add({ toolId: t.toolId, dueAt, stage, recipientId: id, digest: "myTools" }));
    const toCrib = (dueAt: string, stage: ReminderStage) => input.cribIds.forEach((id) => add({ toolId: t.toolId, dueAt, stage, recipientId: id, digest: "crib" }));
    const toQuality = (dueAt: string, stage: ReminderStage, digest: DigestKey) => input.qualityIds.forEach((id) => add({ toolId: t.toolId, dueAt, stage, recipientId: id, digest }));

    // Not returned by the end of the shift it was issued for: whatever its calibration says.
    if (t.custodian && Date.parse(t.custodian.dueBackAt) < Date.parse(input.at)) {
      const day = input.dayOf(t.custodian.dueBackAt);
      toHolders(day, "not_returned");
      toCrib(day, "not_returned");
    }

    if (!RECALLED.has(t.status) || t.dueAt === null || t.daysToDue === null) continue;
    const stages: ReminderStage[] = [];
    if (t.daysToDue < 0) stages.push("overdue");
    else {
      const s = dueStage(t.daysToDue, input.stages);
      if (s !== null) stages.push(`due_${s}`);
    }
    if (t.usageLimit !== null && t.usesRemaining !== null) {
      if (t.usesRemaining === 0) stages.push("usage_limit");
      else if (usageRunningLow(t.usesRemaining, t.usageLimit)) stages.push("usage_low");
    }
    for (const stage of stages) {
      toHolders(t.dueAt, stage);
      toCrib(t.dueAt, stage);
      if (stage === "overdue" || stage === "usage_limit") toQuality(t.dueAt, stage, "quality");
    }
    // Overdue by date or by a usage limit reached.
    if (t.status === "overdue" && needsEscalation(Math.max(0, -t.daysToDue), input.escalationDays, t.custodian !== null)) {
      toQuality(t.dueAt, "escalation", "escalations");
    }
  }
  return out;
}

/** How each kind of reminder reads in a digest and in the run's log. */
export function stageLabel(stage: string): string {
  const m = /^due_(\d+)$/.exec(stage);
  if (m) return m[1] === "0" ? "Calibration runs out today" : `Calibration due within ${m[1]} days`;
  const labels: Record<string, string> = {
    overdue: "Overdue for calibration",
    usage_low: "Few uses left before calibration",
    usage_limit: "Usage limit reached",
    not_returned: "Not returned to the crib",
    escalation: "Escalated to quality",
  };
  return labels[stage] ?? stage;
}
