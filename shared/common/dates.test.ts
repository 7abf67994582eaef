import { describe, expect, it } from "vitest";
import { addDays, calendarDate, daysBetween, isCalendarDate, isValidTimeZone } from "./dates";

describe("calendar date of an instant in the shop's time zone", () => {
  it("late evening on the last day of a month is still that day in Chicago, though already the next day in UTC", () => {
    expect(calendarDate("2026-03-31T23:30:00-05:00", "America/Chicago")).toBe("2026-03-31");
    expect(calendarDate("2026-03-31T23:30:00-05:00", "UTC")).toBe("2026-04-01");
  });

  it("Chicago midnight falls on the right day on both sides of the spring-forward night (8 March 2026)", () => {
    expect(calendarDate("2026-03-08T05:59:00Z", "America/Chicago")).toBe("2026-03-07"); // 23:59 CST
    expect(calendarDate("2026-03-08T06:00:00Z", "America/Chicago")).toBe("2026-03-08"); // 00:00 CST
    expect(calendarDate("2026-03-09T04:59:00Z", "America/Chicago")).toBe("2026-03-08"); // 23:59 CDT
    expect(calendarDate("2026-03-09T05:00:00Z", "America/Chicago")).toBe("2026-03-09"); // 00:00 CDT
  });

  it("Chicago midnight falls on the right day on both sides of the fall-back night (1 November 2026)", () => {
    expect(calendarDate("2026-11-01T04:59:00Z", "America/Chicago")).toBe("2026-10-31"); // 23:59 CDT
    expect(calendarDate("2026-11-01T05:00:00Z", "America/Chicago")).toBe("2026-11-01"); // 00:00 CDT
    expect(calendarDate("2026-11-02T05:59:00Z", "America/Chicago")).toBe("2026-11-01"); // 23:59 CST
    expect(calendarDate("2026-11-02T06:00:00Z", "America/Chicago")).toBe("2026-11-02"); // 00:00 CST
  });

  it("Berlin midnight falls on the right day around the summer-time changes (29 March and 25 October 2026)", () => {
    expect(calendarDate("2026-03-28T22:59:00Z", "Europe/Berlin")).toBe("2026-03-28"); // 23:59 CET
    expect(calendarDate("2026-03-28T23:00:00Z", "Europe/Berlin")).toBe("2026-03-29"); // 00:00 CET
    expect(calendarDate("2026-03-29T21:59:00Z", "Europe/Berlin")).toBe("2026-03-29"); // 23:59 CEST
    expect(calendarDate("2026-03-29T22:00:00Z", "Europe/Berlin")).toBe("2026-03-30"); // 00:00 CEST
    expect(calendarDate("2026-10-25T22:59:00Z", "Europe/Berlin")).toBe("2026-10-25"); // 23:59 CET
    expect(calendarDate("2026-10-25T23:00:00Z", "Europe/Berlin")).toBe("2026-10-26");
  });

  it("asked one after another, the last millisecond of a day and the first of the next give two dates, in whole-hour and whole-second zones", () => {
    // The answer is kept for its UTC second (one status lookup after another asks for the same second); a local
    // midnight falls on a whole UTC second because zone offsets are whole seconds. Africa/Monrovia kept -0:44:30
    // until 1972 (tz database, from memory; the runtime's own zone data agrees with it here).
    expect(calendarDate("2026-03-08T05:59:59.000Z", "America/Chicago")).toBe("2026-03-07");
    expect(calendarDate("2026-03-08T05:59:59.999Z", "America/Chicago")).toBe("2026-03-07");
    expect(calendarDate("2026-03-08T06:00:00.000Z", "America/Chicago")).toBe("2026-03-08");
    expect(calendarDate("1970-01-01T00:44:29.000Z", "Africa/Monrovia")).toBe("1969-12-31");
    expect(calendarDate("1970-01-01T00:44:29.999Z", "Africa/Monrovia")).toBe("1969-12-31");
    expect(calendarDate("1970-01-01T00:44:30.000Z", "Africa/Monrovia")).toBe("1970-01-01");
    // The same second in another zone is another answer.
    expect(calendarDate("1970-01-01T00:44:30.000Z", "Asia/Tokyo")).toBe("1970-01-01");
    expect(calendarDate("1970-01-01T00:44:30.000Z", "America/Chicago")).toBe("1969-12-31");
  });

  it("accepts a Date as well as ISO text, and refuses text that is not an instant", () => {
    expect(calendarDate(new Date("2026-06-15T12:00:00Z"), "Europe/Berlin")).toBe("2026-06-15");
    expect(() => calendarDate("not a date", "UTC")).toThrow(RangeError);
  });

  it("an unknown time zone is recognised as such", () => {
    expect(isValidTimeZone("America/Chicago")).toBe(true);
    expect(isValidTimeZone("Mars/Olympus")).toBe(false);
  });
});

describe("calendar arithmetic", () => {
  it("a day added across a DST change is one calendar day", () => {
    expect(addDays("2026-03-07", 1)).toBe("2026-03-08");
    expect(addDays("2026-03-28", 2)).toBe("2026-03-30");
    expect(daysBetween("2026-03-07", "2026-03-09")).toBe(2);
    expect(daysBetween("2026-10-24", "2026-10-26")).toBe(2);
  });

  it("adding days runs over month ends, leap days and years", () => {
    expect(addDays("2026-01-31", 30)).toBe("2026-03-02");
    expect(addDays("2028-02-28", 1)).toBe("2028-02-29");
    expect(addDays("2026-03-31", 365)).toBe("2027-03-31");
    expect(addDays("2026-03-01", -1)).toBe("2026-02-28");
  });

  it("days between dates is negative when the second date is earlier", () => {
    expect(daysBetween("2026-12-01", "2026-11-30")).toBe(-1);
    expect(daysBetween("2026-01-01", "2027-01-01")).toBe(365);
  });

  it("a date that does not exist is refused", () => {
    expect(isCalendarDate("2026-02-29")).toBe(false);
    expect(isCalendarDate("2028-02-29")).toBe(true);
    expect(() => addDays("2026-02-30", 1)).toThrow(RangeError);
    expect(() => addDays("2026-02-01", 1.5)).toThrow(RangeError);
  });
});
