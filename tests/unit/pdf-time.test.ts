import { describe, expect, it } from "vitest";
import { printedInstant } from "../../server/platform/pdf";

describe("instants printed on check sheets, labels and reports", () => {
  it("a reading five minutes after midnight prints as 00:05, not 24:05", () => {
    expect(printedInstant("2026-06-15T05:05:00Z", "America/Chicago")).toBe("2026-06-15 00:05");
  });
});
