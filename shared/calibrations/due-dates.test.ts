import { describe, expect, it } from "vitest";
import { daysToDue, isOverdue, nextDueAt } from "./due-dates";

const CHICAGO = "America/Chicago";

describe("next due date (api.md: calendar date of performedAt in the shop zone + interval; no grace period)", () => {
  it("a calibration at 23:30 local the day before a month end counts from that local day, not the UTC day", () => {
    // 2026-03-30T23:30 CDT is already 31 March in UTC.
    expect(nextDueAt({ performedAt: "2026-03-30T23:30:00-05:00", intervalDays: 1, timeZone: CHICAGO })).toBe("2026-03-31");
    expect(nextDueAt({ performedAt: "2026-03-30T23:30:00-05:00", intervalDays: 365, timeZone: CHICAGO })).toBe("2027-03-30");
    // The same instant as the server stores it, in UTC.
    expect(nextDueAt({ performedAt: "2026-03-31T04:30:00Z", intervalDays: 1, timeZone: CHICAGO })).toBe("2026-03-31");
  });

  it("a calibration at 23:30 on the last day of March is due a whole interval from 31 March", () => {
    expect(nextDueAt({ performedAt: "2026-03-31T23:30:00-05:00", intervalDays: 30, timeZone: CHICAGO })).toBe("2026-04-30");
  });

  it("an interval that is not a positive whole number of days is refused", () => {
    expect(() => nextDueAt({ performedAt: "2026-03-01T10:00:00Z", intervalDays: 0, timeZone: CHICAGO })).toThrow(RangeError);
    expect(() => nextDueAt({ performedAt: "2026-03-01T10:00:00Z", intervalDays: 30.5, timeZone: CHICAGO })).toThrow(RangeError);
  });
});

describe("overdue from the day after the due date", () => {
  it("a tool is usable at 23:59 on its due date and overdue at 00:00 the next day, shop time", () => {
    expect(isOverdue("2026-11-30", "2026-11-30T23:59:00-06:00", CHICAGO)).toBe(false);
    expect(isOverdue("2026-11-30", "2026-12-01T00:00:00-06:00", CHICAGO)).toBe(true);
  });

  it("the shop's zone decides, not UTC: 20:00 in Chicago on the due date is already the next day in UTC", () => {
    expect(isOverdue("2026-11-30", new Date("2026-12-01T02:00:00Z"), CHICAGO)).toBe(false);
    expect(isOverdue("2026-11-30", new Date("2026-12-01T02:00:00Z"), "UTC")).toBe(true);
  });

  it("days to due are zero on the due date and negative once overdue", () => {
    expect(daysToDue("2026-11-30", "2026-11-20T12:00:00-06:00", CHICAGO)).toBe(10);
    expect(daysToDue("2026-11-30", "2026-11-30T12:00:00-06:00", CHICAGO)).toBe(0);
    expect(daysToDue("2026-11-30", "2026-12-02T12:00:00-06:00", CHICAGO)).toBe(-2);
  });
});
