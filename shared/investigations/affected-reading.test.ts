import { describe, expect, it } from "vitest";
import { rejudgeAffectedReading, type ReadingUnderReview, type ToolErrors } from "./affected-reading";
import { rejudgeCalibration } from "./cascade";
import { formatExactLength, formatSignedLength } from "./format";

// Demo limits (invented): pin bore 0.9995–1.0005 in; journal 0.9984–0.9992 in; clearance RC4 at 1.000 in,
// 0.0008 to 0.0028 in (ANSI B4.1-1967 (R2009) as printed in Machinery's Handbook). Clearance = bore − journal
// (common practice). Micrometer MPE ± 0.0001 in (ASME B89.1.13, secondary source).
const open = { min: null, max: null, serviceableMin: null, serviceableMax: null };
const RC4 = { ...open, min: 0.0008, max: 0.0028 };
const micrometer: ToolErrors = { unit: "in", points: [{ nominal: 0.5, error: 0.0003, uncertainty: null }, { nominal: 1, error: -0.0001, uncertainty: null }] };

function journal(size: number, boreSize: number | null): ReadingUnderReview {
  return { unit: "in", size, kind: "journal", itemLabel: "Journal", sizeLimits: { ...open, min: 0.9984, max: 0.9992 }, clearances: [{ label: "RC4 clearance", side: "journal", otherSize: boreSize, limits: RC4 }], verdict: "within_limits" };
}

describe("re-judging one affected reading with every judgement it fed", () => {
  it("the journal side: a micrometer reading 0.0001 small at 1.000 in made the journal read small and the clearance read large", () => {
    // Journal 0.9984 (on the minimum), bore 1.0012: clearance 0.0028 (on the maximum, ANSI B4.1 RC4).
    const r = rejudgeAffectedReading(journal(0.9984, 1.0012), micrometer);
    // Size 0.9984 − (−0.0001) = 0.9985; clearance 0.0028 + (−0.0001) = 0.0027: both stay within, exactly.
    expect(r.basis).toContain("0.9985");
    expect(r.basis).toContain("0.0027");
    // But the largest error (+0.0003 at 0.500) as a bound takes the journal to 0.9981 — below its minimum.
    expect(r.verdictCouldChange).toBe(true);
    expect(r.basis).toContain("Conservative bound with the largest error found (+0.0003 in at 0.5 in)");
  });

  it("without the other side of its clearance read, only the size is judged", () => {
    const r = rejudgeAffectedReading({ ...journal(0.9988, null), sizeLimits: { ...open, min: 0.9984, max: 0.9992 } }, { unit: "in", points: [{ nominal: 1, error: -0.0001, uncertainty: null }] });
    expect(r.measuredValue).toBe(0.9988);
    expect(r.correctedValue).toBe(0.9989);
    expect(r.marginBefore).toBe(0.0004);
    expect(r.marginAfter).toBe(0.0003);
    expect(r.verdictCouldChange).toBe(false);
  });

  it("a metric tool's error is converted exactly into the inch reading (1 in = 25.4 mm, NIST SP 811 App. B)", () => {
    // +0.00254 mm at 25.4 mm is +0.0001 in at 1 in.
    const r = rejudgeAffectedReading(
      { ...journal(0.9988, null), clearances: [] },
      { unit: "mm", points: [{ nominal: 25.4, error: 0.00254, uncertainty: null }] },
    );
    expect(r.correctedValue).toBe(0.9987);
  });

  it("a feeler go leaf found thinner than marked proves less than the check assumed; a thicker one only strengthens it (common practice)", () => {
    const base: ReadingUnderReview = {
      unit: "in",
      size: null,
      kind: "feeler",
      itemLabel: "Ring side clearance",
      sizeLimits: null,
      clearances: [],
      verdict: "within_limits",
      feeler: { goLeaf: { id: "leaf-3", nominal: 0.003 }, noGoLeaf: { id: "leaf-7", nominal: 0.007 }, goEntered: true, noGoEntered: false, limits: { ...open, min: 0.004, max: 0.006 } },
    };
    const thin = rejudgeAffectedReading(base, { unit: "in", points: [{ nominal: 0.003, error: -0.0002, uncertainty: null, elementId: "leaf-3" }] });
    expect(thin.verdictCouldChange).toBe(true);
    const thick = rejudgeAffectedReading(base, { unit: "in", points: [{ nominal: 0.003, error: 0.0002, uncertainty: null, elementId: "leaf-3" }, { nominal: 0.007, error: -0.0001, uncertainty: null, elementId: "leaf-7" }] });
    expect(thick.verdictCouldChange).toBe(false);
    expect(rejudgeAffectedReading(base, { unit: "in", points: null }).verdictCouldChange).toBe(true);
  });
});

describe("re-judging a calibration with its standard's error (the cascade)", () => {
  it("a point recorded +0.00008 against a standard really 0.00005 small was +0.00013: outside ± 0.0001 (simple acceptance, ILAC-G8 §4.2.1)", () => {
    const r = rejudgeCalibration([{ nominal: 0.5, reference: 0.5, asFound: 0.50008, asLeft: null, mpe: 0.0001, uncertainty: null }], [{ nominal: 0.5, error: -0.00005, uncertainty: null }], "simple", "in");
    expect(r.measuredValue).toBe(0.00008);
    expect(r.correctedValue).toBe(0.00013);
    expect(r.marginBefore).toBe(0.00002);
    expect(r.marginAfter).toBe(-0.00003);
    expect(r.verdictCouldChange).toBe(true);
    expect(r.toolErrorsAsLeft).toEqual([{ nominal: 0.5, error: 0.00013, uncertainty: null }]);
  });

  it("the finding's uncertainty can carry a point across the limit; expanded uncertainties combine root-sum-square (GUM 5.1.2)", () => {
    const r = rejudgeCalibration([{ nominal: 0.5, reference: 0.5, asFound: 0.50006, asLeft: null, mpe: 0.0001, uncertainty: 0.00003 }], [{ nominal: 0.5, error: -0.00002, uncertainty: 0.00004 }], "simple", "in");
    // Central: +0.00008 (inside); with U of the finding: up to +0.00012 (outside).
    expect(r.correctedValue).toBe(0.00008);
    expect(r.verdictCouldChange).toBe(true);
    expect(r.toolErrorsAsLeft[0].uncertainty).toBe(0.00005);
  });
});

describe("showing exact lengths", () => {
  it("keeps the unit's customary decimals and never hides a finer digit", () => {
    expect(formatExactLength(0.5, "in")).toBe("0.5000");
    expect(formatExactLength(0.00013, "in")).toBe("0.00013");
    expect(formatSignedLength(0.0003, "in")).toBe("+0.0003");
    expect(formatSignedLength(-0.0002, "in")).toBe("-0.0002");
    expect(formatSignedLength(0, "mm")).toBe("0.000");
  });
});
