import { describe, expect, it } from "vitest";
import { changeRows, fieldWords } from "../../shared/audit/changes";

// How the audit trail shows a change to a person: a presentation rule of our own (common practice, no source).
describe("an audit line's change, in words", () => {
  it("names fields in words, whatever their spelling in the record", () => {
    expect(fieldWords("supersedesId")).toBe("Supersedes id");
    expect(fieldWords("due_back_at")).toBe("Due back at");
    expect(fieldWords("usageLimit")).toBe("Usage limit");
  });

  it("a reading's after: nested fields by their path, lists joined, nothing marked changed when there is no before", () => {
    const rows = changeRows(null, { itemKey: "J001", values: ["2.5001", "2.5002"], tools: ["B-000001"], flags: [], override: { reason: "Checked against a gauge block" }, supersedesId: null });
    expect(rows).toEqual([
      { field: "Item key", before: null, after: "J001", changed: false },
      { field: "Values", before: null, after: "2.5001, 2.5002", changed: false },
      { field: "Tools", before: null, after: "B-000001", changed: false },
      { field: "Flags", before: null, after: "none", changed: false },
      { field: "Override › reason", before: null, after: "Checked against a gauge block", changed: false },
      { field: "Supersedes id", before: null, after: "none", changed: false },
    ]);
  });

  it("a setting changed: the changed field is marked, the unchanged one is not, and a field only one side has is shown", () => {
    const rows = changeRows({ dueSoonDays: 14, shopTimeZone: "America/Chicago", escalate: true }, { dueSoonDays: 21, shopTimeZone: "America/Chicago", reminderCron: "0 6 * * *" });
    expect(rows).toEqual([
      { field: "Due soon days", before: "14", after: "21", changed: true },
      { field: "Shop time zone", before: "America/Chicago", after: "America/Chicago", changed: false },
      { field: "Escalate", before: "yes", after: null, changed: true },
      { field: "Reminder cron", before: null, after: "0 6 * * *", changed: true },
    ]);
  });

  it("a list of records is numbered, and a plain value stands as itself", () => {
    expect(changeRows(null, { points: [{ nominal: 1, asFound: 1.0001 }, { nominal: 2, asFound: 2 }] }).map((r) => [r.field, r.after])).toEqual([
      ["Points 1 › nominal", "1"],
      ["Points 1 › as found", "1.0001"],
      ["Points 2 › nominal", "2"],
      ["Points 2 › as found", "2"],
    ]);
    expect(changeRows("open", "closed")).toEqual([{ field: "Value", before: "open", after: "closed", changed: true }]);
  });
});
