import { describe, expect, it } from "vitest";
import { describeCron } from "./cron-words";

// Field meanings: POSIX crontab (minute hour day-of-month month weekday; 0 and 7 are Sunday).
describe("a reminder schedule in words", () => {
  it("the default daily schedule", () => {
    expect(describeCron("0 6 * * *")).toBe("Every day at 06:00");
  });
  it("working days and two times", () => {
    expect(describeCron("30 6,14 * * 1-5")).toBe("Monday to Friday at 06:30 and 14:30");
    expect(describeCron("0 7 * * MON-FRI")).toBe("Monday to Friday at 07:00");
  });
  it("named weekdays, Sunday as 0 or 7", () => {
    expect(describeCron("0 6 * * 1,3,5")).toBe("Every Monday, Wednesday and Friday at 06:00");
    expect(describeCron("15 22 * * 7")).toBe("Every Sunday at 22:15");
  });
  it("hourly and monthly schedules", () => {
    expect(describeCron("5 * * * *")).toBe("Every hour at 05 minutes past");
    expect(describeCron("0 6 1 * *")).toBe("On the 1st of every month at 06:00");
    expect(describeCron("*/15 * * * *")).toBe("Every 15 minutes");
  });
  it("a schedule it cannot put in words keeps its fields, labelled", () => {
    expect(describeCron("0 6 1-7 * 1")).toMatch(/^On a custom schedule \(cron fields “0 6 1-7 \* 1”/);
  });
});
