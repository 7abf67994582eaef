import { describe, expect, it } from "vitest";
import { endOfShiftAfter, zonedInstant } from "./shift";

// Time-zone arithmetic against the IANA rules built into the runtime (common practice, no source).
describe("end of shift in the shop's time zone", () => {
  it("17:00 in Chicago in summer (CDT, UTC-5) is 22:00 UTC", () => {
    expect(zonedInstant("2026-06-15", "17:00", "America/Chicago").toISOString()).toBe("2026-06-15T22:00:00.000Z");
  });

  it("17:00 in Chicago in winter (CST, UTC-6) is 23:00 UTC", () => {
    expect(zonedInstant("2026-01-15", "17:00", "America/Chicago").toISOString()).toBe("2026-01-15T23:00:00.000Z");
  });

  it("on the day clocks go forward the end of shift still falls at 17:00 local", () => {
    expect(zonedInstant("2026-03-08", "17:00", "America/Chicago").toISOString()).toBe("2026-03-08T22:00:00.000Z");
  });

  it("a tool issued in the morning is due back at today's end of shift", () => {
    expect(endOfShiftAfter(new Date("2026-06-15T15:00:00Z"), "17:00", "America/Chicago").toISOString()).toBe("2026-06-15T22:00:00.000Z");
  });

  it("a tool issued after the end of shift is due back at tomorrow's", () => {
    expect(endOfShiftAfter(new Date("2026-06-15T23:30:00Z"), "17:00", "America/Chicago").toISOString()).toBe("2026-06-16T22:00:00.000Z");
  });
});
