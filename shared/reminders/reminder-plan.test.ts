import { describe, expect, it } from "vitest";
import { dueStage, needsEscalation, planReminders, type ToolForReminders } from "./reminder-plan";

// Lead times 30/7/0 days and escalation after 7 days overdue are the shop's
// settings defaults (common practice, no source).
const base = {
  at: "2026-06-15T15:00:00Z",
  today: "2026-06-15",
  dayOf: (i: string) => i.slice(0, 10),
  stages: [30, 7, 0],
  escalationDays: 7,
  cribIds: ["crib-1"],
  qualityIds: ["quality-1"],
};
const tool = (over: Partial<ToolForReminders>): ToolForReminders => ({
  toolId: "t1",
  status: "due_soon",
  dueAt: "2026-07-15",
  daysToDue: 30,
  usageLimit: null,
  usesRemaining: null,
  ownerUserId: null,
  custodian: null,
  ...over,
});

describe("which lead-time stage a tool is in", () => {
  it("a tool 30 days from due is at the 30-day stage, and stays there until 7 days out", () => {
    expect(dueStage(30, [30, 7, 0])).toBe(30);
    expect(dueStage(8, [30, 7, 0])).toBe(30);
    expect(dueStage(7, [30, 7, 0])).toBe(7);
    expect(dueStage(0, [30, 7, 0])).toBe(0);
  });
  it("a tool further out than the longest lead time, or already overdue, has no stage", () => {
    expect(dueStage(31, [30, 7, 0])).toBeNull();
    expect(dueStage(-1, [30, 7, 0])).toBeNull();
  });
  it("a tool registered late skips the stages it has already passed", () => {
    expect(dueStage(5, [30, 7, 0])).toBe(7);
  });
});

describe("who is reminded of what", () => {
  it("a tool coming due in the crib is on the crib attendants' list only", () => {
    const plan = planReminders({ ...base, tools: [tool({})] });
    expect(plan).toEqual([{ toolId: "t1", dueAt: "2026-07-15", stage: "due_30", recipientId: "crib-1", digest: "crib" }]);
  });

  it("an issued tool coming due goes to the person who has it as well as the crib", () => {
    const plan = planReminders({ ...base, tools: [tool({ daysToDue: 7, custodian: { userId: "mech", dueBackAt: "2026-06-15T22:00:00Z" } })] });
    expect(plan.map((p) => [p.recipientId, p.stage, p.digest])).toEqual([
      ["mech", "due_7", "myTools"],
      ["crib-1", "due_7", "crib"],
    ]);
  });

  it("an overdue tool goes to quality too, and is escalated once overdue for the escalation period", () => {
    const week = planReminders({ ...base, tools: [tool({ status: "overdue", daysToDue: -7 })] });
    expect(week.filter((p) => p.recipientId === "quality-1").map((p) => p.stage)).toEqual(["overdue", "escalation"]);
    const day = planReminders({ ...base, tools: [tool({ status: "overdue", daysToDue: -1 })] });
    expect(day.filter((p) => p.recipientId === "quality-1").map((p) => p.stage)).toEqual(["overdue"]);
  });

  it("an overdue tool still in someone's hands is escalated at once", () => {
    expect(needsEscalation(1, 7, true)).toBe(true);
    expect(needsEscalation(1, 7, false)).toBe(false);
  });

  it("a mechanic's own tool reminds its owner", () => {
    const plan = planReminders({ ...base, tools: [tool({ ownerUserId: "owner", daysToDue: 0 })] });
    expect(plan.find((p) => p.recipientId === "owner")).toMatchObject({ stage: "due_0", digest: "myTools" });
  });

  it("a tool near its usage limit, and one that reached it, are recalled by usage", () => {
    const low = planReminders({ ...base, tools: [tool({ daysToDue: 200, usageLimit: 50, usesRemaining: 5 })] });
    expect(low.map((p) => p.stage)).toEqual(["usage_low"]);
    const reached = planReminders({ ...base, tools: [tool({ status: "overdue", daysToDue: 200, usageLimit: 50, usesRemaining: 0 })] });
    expect(reached.map((p) => `${p.recipientId}:${p.stage}`)).toEqual(["crib-1:usage_limit", "quality-1:usage_limit"]);
  });

  it("a tool not returned after its due-back time reminds its holder and the crib, keyed by the day it was due back", () => {
    const plan = planReminders({ ...base, tools: [tool({ status: "in_calibration", daysToDue: 200, custodian: { userId: "mech", dueBackAt: "2026-06-14T22:00:00Z" } })] });
    expect(plan).toEqual([
      { toolId: "t1", dueAt: "2026-06-14", stage: "not_returned", recipientId: "mech", digest: "myTools" },
      { toolId: "t1", dueAt: "2026-06-14", stage: "not_returned", recipientId: "crib-1", digest: "crib" },
    ]);
  });

  it("a quarantined or lost tool is not recalled for calibration", () => {
    expect(planReminders({ ...base, tools: [tool({ status: "quarantined", daysToDue: -3 })] })).toEqual([]);
    expect(planReminders({ ...base, tools: [tool({ status: "lost", daysToDue: 0 })] })).toEqual([]);
  });

  it("a crib attendant holding a tool gets one copy of each reminder, in their own digest", () => {
    const plan = planReminders({ ...base, tools: [tool({ daysToDue: 7, custodian: { userId: "crib-1", dueBackAt: "2026-06-15T22:00:00Z" } })] });
    expect(plan).toEqual([{ toolId: "t1", dueAt: "2026-07-15", stage: "due_7", recipientId: "crib-1", digest: "myTools" }]);
  });
});
