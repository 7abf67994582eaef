import { describe, expect, it } from "vitest";
import { JOB_STATE_LABELS, JOB_STATES, jobStateOfSheet, jobStateOfSummary } from "./labels";

// Shop rule (common practice, no source): a sheet is signed only when nothing was taken after its last sign-off.
describe("one name per check-sheet state", () => {
  it("a sheet with readings and no sign-off is awaiting signature in the list and on the sheet alike", () => {
    expect(jobStateOfSummary({ status: "open", signedAt: null, readingCount: 3 })).toBe("awaiting_signature");
    expect(jobStateOfSheet({ locked: false, changedSinceSignoff: false, summary: { recorded: 3 } })).toBe("awaiting_signature");
  });
  it("a sheet without readings is open; a signed one is signed", () => {
    expect(jobStateOfSummary({ status: "open", signedAt: null, readingCount: 0 })).toBe("open");
    expect(jobStateOfSheet({ locked: true, changedSinceSignoff: false, summary: { recorded: 3 } })).toBe("signed");
    expect(jobStateOfSummary({ status: "signed", signedAt: "2026-01-02T10:00:00Z", readingCount: 3 })).toBe("signed");
  });
  it("a sheet corrected after its sign-off needs signing again in the list and on the sheet alike", () => {
    expect(jobStateOfSummary({ status: "open", signedAt: "2026-01-02T10:00:00Z", readingCount: 3 })).toBe("needs_signing_again");
    expect(jobStateOfSheet({ locked: false, changedSinceSignoff: true, summary: { recorded: 3 } })).toBe("needs_signing_again");
  });
  it("every state has its own name", () => {
    expect(new Set(JOB_STATES.map((s) => JOB_STATE_LABELS[s])).size).toBe(JOB_STATES.length);
  });
});
