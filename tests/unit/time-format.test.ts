import { afterEach, describe, expect, it } from "vitest";
import { formatDate, formatDateTime, formatTime, setShopTimeZone, zoneDiffers } from "../../src/lib/format";

// The one time format of the client: dates as ISO 8601 calendar dates (YYYY-MM-DD), times on the 24-hour
// clock (ISO 8601 hh:mm) in the shop's zone. Offsets of America/Chicago (UTC−6 in winter, UTC−5 in summer,
// daylight saving from 2026-03-08 to 2026-11-01) are from the IANA time zone database.
const browserZone = Intl.DateTimeFormat().resolvedOptions().timeZone;
afterEach(() => setShopTimeZone(browserZone));

describe("times as the shop floor reads them", () => {
  it("a date already written as a calendar date is shown as it is; an instant becomes the shop's date", () => {
    setShopTimeZone("America/Chicago");
    expect(formatDate("2026-12-02")).toBe("2026-12-02");
    // 03:30 UTC on 2 December is still the evening of 1 December in Chicago.
    expect(formatDate("2026-12-02T03:30:00Z")).toBe("2026-12-01");
    expect(formatDate(null)).toBe("—");
    expect(formatDate("not a date")).toBe("—");
  });

  it("times are 24-hour in the shop's zone, never AM/PM, winter and summer alike", () => {
    setShopTimeZone("America/Chicago");
    expect(formatDateTime("2026-12-02T19:15:00Z")).toMatch(/^2026-12-02 13:15( \S+)?$/);
    expect(formatTime("2026-07-01T12:05:00Z")).toMatch(/^07:05( \S+)?$/);
    expect(formatDateTime("2026-12-02T19:15:00Z")).not.toMatch(/AM|PM/);
  });

  it("the zone is named exactly when the shop's zone is not the browser's", () => {
    setShopTimeZone(browserZone === "Asia/Tokyo" ? "America/Chicago" : "Asia/Tokyo");
    expect(zoneDiffers()).toBe(true);
    expect(formatDateTime("2026-12-02T00:00:00Z")).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2} \S+$/);
    setShopTimeZone(browserZone);
    expect(zoneDiffers()).toBe(false);
    expect(formatDateTime("2026-12-02T00:00:00Z")).toMatch(/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}$/);
  });

  it("an unknown zone name keeps the browser's zone instead of failing", () => {
    setShopTimeZone("Nowhere/Invented");
    expect(zoneDiffers()).toBe(false);
  });
});
