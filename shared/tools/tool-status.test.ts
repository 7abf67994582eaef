import { describe, expect, it } from "vitest";
import { STATUS_LABELS, TOOL_STATUSES, deriveToolStatus, isUsableStatus, type ToolStatusInput } from "./tool-status";

const CHICAGO = "America/Chicago";

// A micrometer calibrated 2025-12-01, due 2026-11-30; asked about mid-2026 (demo data).
function input(overrides: Partial<ToolStatusInput> = {}, tool: Partial<ToolStatusInput["tool"]> = {}): ToolStatusInput {
  return {
    at: "2026-06-15T10:00:00-05:00",
    timeZone: CHICAGO,
    dueSoonDays: 30,
    tool: { calibrationRequired: true, lifecycle: "active", usageLimit: null, ...tool },
    lastCalibration: { performedAt: "2025-12-01T09:00:00-06:00", result: "pass", nextDueAt: "2026-11-30" },
    pendingReview: null,
    usesSinceCalibration: 0,
    failedCheckSinceCalibration: null,
    hold: null,
    atLab: null,
    ...overrides,
  };
}

const everything: Partial<ToolStatusInput> = {
  hold: { reason: "Dropped on the floor", since: "2026-06-01T08:00:00-05:00" },
  atLab: { since: "2026-06-10T08:00:00-05:00", lab: "Demo Metrology Lab", expectedBackAt: "2026-06-24" },
  failedCheckSinceCalibration: { performedAt: "2026-05-01T08:00:00-05:00", deviation: 0.0003 },
};

describe("tool status: one derivation for server and client", () => {
  it("a tool calibrated and not yet near its due date is in calibration and usable", () => {
    const s = deriveToolStatus(input());
    expect(s).toMatchObject({ status: "in_calibration", usable: true, usableForAcceptance: true, dueAt: "2026-11-30", usesRemaining: null });
    expect(s.daysToDue).toBe(168);
    expect(s.reasons).toEqual(["In calibration until 2026-11-30."]);
  });

  it("a tool within the warning window is due soon and still usable, with a notice", () => {
    const s = deriveToolStatus(input({ at: "2026-11-01T10:00:00-05:00" }));
    expect(s).toMatchObject({ status: "due_soon", usable: true, daysToDue: 29 });
    expect(s.reasons[0]).toBe("Calibration runs out on 2026-11-30 (in 29 days); plan recalibration.");
  });

  it("the warning window is inclusive: exactly dueSoonDays before the due date is due soon, one more day is not", () => {
    expect(deriveToolStatus(input({ at: "2026-10-31T12:00:00-05:00" })).status).toBe("due_soon");
    expect(deriveToolStatus(input({ at: "2026-10-30T12:00:00-05:00" })).status).toBe("in_calibration");
  });

  it("a tool is usable through 23:59 on its due date and overdue from 00:00 the next day, shop time (no grace period)", () => {
    const last = deriveToolStatus(input({ at: "2026-11-30T23:59:00-06:00" }));
    expect(last).toMatchObject({ status: "due_soon", usable: true, daysToDue: 0 });
    expect(last.reasons[0]).toContain("today");
    const next = deriveToolStatus(input({ at: "2026-12-01T00:00:00-06:00" }));
    expect(next).toMatchObject({ status: "overdue", usable: false, usableForAcceptance: false, daysToDue: -1 });
    expect(next.reasons).toEqual(["Calibration ran out on 2026-11-30; do not use until recalibrated."]);
  });

  it("the shop's zone decides the boundary: 05:30 UTC on 1 December is still 30 November in Chicago", () => {
    expect(deriveToolStatus(input({ at: "2026-12-01T05:30:00Z" })).status).toBe("due_soon");
    expect(deriveToolStatus(input({ at: "2026-12-01T05:30:00Z", timeZone: "Europe/Berlin" })).status).toBe("overdue");
  });

  it("a tool that has reached its usage limit is overdue even before its due date", () => {
    const s = deriveToolStatus(input({ usesSinceCalibration: 50 }, { usageLimit: 50 }));
    expect(s).toMatchObject({ status: "overdue", usable: false, usesRemaining: 0 });
    expect(s.reasons[0]).toContain("Usage limit reached: 50 of 50 uses");
  });

  it("a tool in its last tenth of uses is due soon (common practice, no source)", () => {
    expect(deriveToolStatus(input({ usesSinceCalibration: 45 }, { usageLimit: 50 }))).toMatchObject({ status: "due_soon", usesRemaining: 5 });
    expect(deriveToolStatus(input({ usesSinceCalibration: 44 }, { usageLimit: 50 }))).toMatchObject({ status: "in_calibration", usesRemaining: 6 });
  });

  it("a tool calibrated for part of its range is limited: usable only within the stated range", () => {
    const s = deriveToolStatus(
      input({
        lastCalibration: {
          performedAt: "2025-12-01T09:00:00-06:00",
          result: "limited",
          nextDueAt: "2026-11-30",
          limitedRange: { min: 0, max: 0.5, unit: "in", note: "Spindle worn above half an inch." },
        },
      }),
    );
    expect(s).toMatchObject({ status: "limited", usable: true, usableForAcceptance: true });
    expect(s.reasons[0]).toBe("Limited use: only within 0–0.5 in. Spindle worn above half an inch.");
  });

  it("a limited tool inside its warning window stays limited and carries the due notice too", () => {
    const s = deriveToolStatus(
      input({
        at: "2026-11-20T10:00:00-06:00",
        lastCalibration: { performedAt: "2025-12-01T09:00:00-06:00", result: "limited", nextDueAt: "2026-11-30", limitedRange: null },
      }),
    );
    expect(s.status).toBe("limited");
    expect(s.reasons).toHaveLength(2);
    expect(s.reasons[1]).toContain("2026-11-30");
  });

  it("a tool found out of tolerance at calibration is out of tolerance and not usable", () => {
    const s = deriveToolStatus(input({ lastCalibration: { performedAt: "2026-06-01T09:00:00-05:00", result: "fail", nextDueAt: "2027-06-01" } }));
    expect(s).toMatchObject({ status: "out_of_tolerance", usable: false });
    expect(s.reasons[0]).toContain("Found out of tolerance at calibration on 2026-06-01");
  });

  it("a failed intermediate check takes a calibrated tool out of use", () => {
    const s = deriveToolStatus(input({ failedCheckSinceCalibration: { performedAt: "2026-06-02T08:00:00-05:00", deviation: 0.0003 } }));
    expect(s).toMatchObject({ status: "out_of_tolerance", usable: false });
    expect(s.reasons[0]).toBe("Failed an intermediate check on 2026-06-02 (off by +0.0003); do not use until recalibrated.");
  });

  it("a failed check older than the latest calibration no longer counts", () => {
    const s = deriveToolStatus(input({ failedCheckSinceCalibration: { performedAt: "2025-11-20T08:00:00-06:00", deviation: -0.0002 } }));
    expect(s.status).toBe("in_calibration");
  });

  it("a quarantined tool is not usable and the reason says since when and why", () => {
    const s = deriveToolStatus(input({ hold: { reason: "Dropped on the floor", since: "2026-06-01T08:00:00-05:00" } }));
    expect(s).toMatchObject({ status: "quarantined", usable: false });
    expect(s.reasons).toEqual(["Quarantined since 2026-06-01: Dropped on the floor"]);
  });

  it("a tool away at an outside lab is at calibration and not available", () => {
    const s = deriveToolStatus(input({ atLab: { since: "2026-06-10T08:00:00-05:00", lab: "Demo Metrology Lab", expectedBackAt: "2026-06-24" } }));
    expect(s).toMatchObject({ status: "at_calibration", usable: false });
    expect(s.reasons[0]).toBe("Away at Demo Metrology Lab for calibration since 2026-06-10; not available. Expected back 2026-06-24.");
  });

  it("a tool with no calibration on record is never calibrated, and a certificate awaiting review is mentioned", () => {
    const s = deriveToolStatus(input({ lastCalibration: null }));
    expect(s).toMatchObject({ status: "never_calibrated", usable: false, dueAt: null, daysToDue: null });
    const pending = deriveToolStatus(
      input({ lastCalibration: null, pendingReview: { performedAt: "2026-06-05T12:00:00-05:00", lab: "Demo Metrology Lab" } }),
    );
    expect(pending.status).toBe("never_calibrated");
    expect(pending.reasons[1]).toContain("Certificate from Demo Metrology Lab (calibrated 2026-06-05) awaiting review");
  });

  it("a certificate awaiting review is mentioned beside an overdue status too", () => {
    const s = deriveToolStatus(
      input({ at: "2026-12-05T10:00:00-06:00", pendingReview: { performedAt: "2026-12-02T12:00:00-06:00", lab: "Demo Metrology Lab" } }),
    );
    expect(s.status).toBe("overdue");
    expect(s.reasons).toHaveLength(2);
    expect(s.reasons[1]).toContain("awaiting review");
  });

  it("an inactive tool must be calibrated before use", () => {
    expect(deriveToolStatus(input({}, { lifecycle: "inactive" }))).toMatchObject({ status: "inactive", usable: false });
  });

  it("a tool that needs no calibration is reference only: usable, never for acceptance readings", () => {
    const s = deriveToolStatus(input({ lastCalibration: null }, { calibrationRequired: false }));
    expect(s).toMatchObject({ status: "reference_only", usable: true, usableForAcceptance: false });
  });

  it("lost and retired tools are not usable", () => {
    expect(deriveToolStatus(input({}, { lifecycle: "lost" }))).toMatchObject({ status: "lost", usable: false });
    expect(deriveToolStatus(input({}, { lifecycle: "retired" }))).toMatchObject({ status: "retired", usable: false });
  });
});

describe("tool status precedence", () => {
  const overdueAt = { at: "2026-12-05T10:00:00-06:00" };
  const cases: [string, ToolStatusInput, string][] = [
    ["retired before lost and everything else", input({ ...everything, ...overdueAt }, { lifecycle: "retired" }), "retired"],
    ["lost before being at a lab", input({ ...everything }, { lifecycle: "lost" }), "lost"],
    ["at the lab before quarantined", input({ ...everything }), "at_calibration"],
    ["quarantined before out of tolerance", input({ ...everything, atLab: null }), "quarantined"],
    ["out of tolerance before inactive", input({ failedCheckSinceCalibration: everything.failedCheckSinceCalibration! }, { lifecycle: "inactive" }), "out_of_tolerance"],
    ["inactive before reference only", input({ lastCalibration: null }, { lifecycle: "inactive", calibrationRequired: false }), "inactive"],
    ["reference only before never calibrated", input({ lastCalibration: null }, { calibrationRequired: false }), "reference_only"],
    ["overdue before limited", input({ ...overdueAt, lastCalibration: { performedAt: "2025-12-01T09:00:00-06:00", result: "limited", nextDueAt: "2026-11-30" } }), "overdue"],
    ["limited before due soon", input({ at: "2026-11-20T10:00:00-06:00", lastCalibration: { performedAt: "2025-12-01T09:00:00-06:00", result: "limited", nextDueAt: "2026-11-30" } }), "limited"],
  ];
  it.each(cases)("%s", (_name, i, expected) => {
    expect(deriveToolStatus(i).status).toBe(expected);
  });

  it("a hold or lab trip that starts after the instant asked about does not count at that instant", () => {
    const s = deriveToolStatus(input({ at: "2026-05-01T10:00:00-05:00", hold: everything.hold!, atLab: everything.atLab! }));
    expect(s.status).toBe("in_calibration");
  });

  it("every status has a label, and only in-calibration, due-soon, limited and reference-only tools are usable", () => {
    for (const s of TOOL_STATUSES) expect(STATUS_LABELS[s]).toMatch(/^[A-Z]/);
    expect(TOOL_STATUSES.filter(isUsableStatus)).toEqual(["in_calibration", "due_soon", "limited", "reference_only"]);
  });

  it("every answer carries at least one sentence a mechanic can read", () => {
    const all = [input(), input({ lastCalibration: null }), input(everything), input({}, { lifecycle: "lost" })];
    for (const i of all) {
      const r = deriveToolStatus(i);
      expect(r.reasons.length).toBeGreaterThan(0);
      for (const reason of r.reasons) expect(reason).toMatch(/^[A-Z].{10,}/);
    }
  });

  it("an instant that is not a date is refused", () => {
    expect(() => deriveToolStatus(input({ at: "yesterday" }))).toThrow(RangeError);
  });
});
