import { describe, expect, it } from "vitest";
import { rejudgeAffectedReading, type ReviewedReading, type ToolErrors } from "./affected-reading";
import { rejudgeCalibration } from "./cascade";
import { formatExactLength, formatSignedLength } from "./format";
import type { ItemRules } from "../inspection/judging";

// Demo limits (invented): valve stem 0.4335–0.4340 in, guide 0.4360–0.4370 in, clearance 0.0020–0.0035 in.
// Clearance = bore − journal; loosest against the maximum, tightest against the minimum (common practice).
// Micrometer MPE ± 0.0001 in (ASME B89.1.13, secondary source); the finding is +0.0003 in at 0.500 in.
const base = { min: null, max: null, serviceableMin: null, serviceableMax: null, boreKey: null, journalKey: null, stationKeys: null, radial: false, outOfRoundMax: null, expansionPerK: null, directions: 2, repeat: 12 };
const ITEMS: ItemRules[] = [
  { ...base, key: "stem", label: "Valve stem dia.", kind: "journal", min: 0.4335, max: 0.434 },
  { ...base, key: "guide", label: "Valve guide bore", kind: "bore", min: 0.436, max: 0.437 },
  { ...base, key: "clearance", label: "Stem to guide clearance", kind: "clearance", boreKey: "guide", journalKey: "stem", min: 0.002, max: 0.0035 },
];
const IN = { tableUnit: "in" as const, tableExpansionPerK: null };
const MIC = "mic-0104";
const OTHER = "mic-0101";
const errors: ToolErrors = { unit: "in", points: [{ nominal: 0.105, error: 0, uncertainty: null }, { nominal: 0.5, error: 0.0003, uncertainty: null }, { nominal: 1, error: -0.0001, uncertainty: null }] };
const reading = (itemKey: string, values: number[], toolIds: string[], over: Partial<ReviewedReading> = {}): ReviewedReading => ({
  id: `${itemKey}-r`,
  itemKey,
  index: 8,
  unit: "in",
  values,
  toolIds,
  recordedVerdict: "within_limits",
  ...over,
});
const label = (i: ItemRules, n: number) => `${i.label} no. ${n}`;

describe("re-judging an affected reading under the sheet's rules, over the tool's error band", () => {
  it("a stem diameter shows a diameter, never its clearance: 0.4338/0.4336 with ±0.0003 could be 0.4333 to 0.4339", () => {
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4338, 0.4336], [MIC]), toolId: MIC, errors, siblings: [reading("guide", [0.4368, 0.4369], [OTHER])], items: ITEMS, ctx: IN, label });
    expect(r.quantity).toBe("diameter");
    expect(r.measuredValue).toBe(0.4336);
    // Most likely: the error at the point nearest the size (+0.0003 at 0.5): 0.4336 − 0.0003.
    expect(r.correctedValue).toBe(0.4333);
    expect([r.bandLow, r.bandHigh]).toEqual([0.4333, 0.4339]);
    expect(r.marginBefore).toBe(0.0001);
    expect(r.marginAfter).toBe(-0.0002);
    expect(r.verdictCouldChange).toBe(true);
    // The clearance it feeds: loosest 0.4369 − 0.4336 = 0.0033 could be 0.0030 to 0.0036 — over 0.0035.
    const fit = r.places.find((p) => p.itemKey === "clearance")!;
    expect(fit).toMatchObject({ label: "Stem to guide clearance no. 8", quantity: "loosest fit", value: 0.0033, low: 0.003, high: 0.0036, couldChange: true });
    expect(r.basis).toContain("Error band ±0.0003 in");
    expect(r.basis).toContain("applied with both signs");
  });

  it("where one micrometer read both the stem and the guide, its error moves both sides: the clearance does not move", () => {
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4338, 0.4337], [MIC]), toolId: MIC, errors, siblings: [reading("guide", [0.4368, 0.4369], [MIC])], items: ITEMS, ctx: IN, label });
    const fit = r.places.find((p) => p.itemKey === "clearance")!;
    expect(fit).toMatchObject({ couldChange: false });
    expect(fit.text).toContain("the same tool read both sides");
  });

  it("a guide read with the failed tool moves the clearance the other way (bore side)", () => {
    const r = rejudgeAffectedReading({ reading: reading("guide", [0.4364, 0.4365], [MIC]), toolId: MIC, errors, siblings: [reading("stem", [0.4338, 0.4338], [OTHER])], items: ITEMS, ctx: IN, label });
    expect(r.quantity).toBe("bore diameter");
    expect([r.bandLow, r.bandHigh]).toEqual([0.4362, 0.4368]);
    // Tightest 0.4364 − 0.4338 = 0.0026 could be 0.0023 to 0.0029: inside 0.0020; loosest 0.0027 → 0.0024 to 0.0030: inside.
    expect(r.verdictCouldChange).toBe(false);
  });

  it("a reading judged outside that the band could bring inside could change", () => {
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4333, 0.4334], [MIC], { recordedVerdict: "outside_limits" }), toolId: MIC, errors, siblings: [], items: ITEMS, ctx: IN, label });
    expect(r.verdictNow).toBe("outside_limits");
    expect(r.verdictCouldChange).toBe(true);
  });

  it("a reading the current rules judge otherwise than recorded could change whatever the band", () => {
    // Recorded within under the earlier rule (smallest reading only); 0.4342 is over the maximum.
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4342, 0.4337], [MIC]), toolId: MIC, errors: { unit: "in", points: [{ nominal: 0.5, error: 0, uncertainty: null }] }, siblings: [], items: ITEMS, ctx: IN, label });
    expect(r.verdictNow).toBe("outside_limits");
    expect(r.verdictCouldChange).toBe(true);
    expect(r.basis).toContain("it was recorded within limits");
  });

  it("a metric tool's error is converted exactly into the inch reading (1 in = 25.4 mm, NIST SP 811 App. B)", () => {
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4338, 0.4338], [MIC]), toolId: MIC, errors: { unit: "mm", points: [{ nominal: 12.7, error: 0.00254, uncertainty: null }] }, siblings: [], items: ITEMS, ctx: IN, label });
    expect([r.bandLow, r.bandHigh]).toEqual([0.4337, 0.4339]);
  });

  it("a lost tool's error is unknown: every verdict resting on it could change", () => {
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4338, 0.4338], [MIC]), toolId: MIC, errors: { unit: "in", points: null }, siblings: [], items: ITEMS, ctx: IN, label });
    expect(r.verdictCouldChange).toBe(true);
    expect(r.correctedValue).toBeNull();
    expect(r.basis).toContain("unknown");
  });

  it("a radial clearance moves by half the error (common practice: radial = diametral / 2)", () => {
    const items = ITEMS.map((i) => (i.key === "clearance" ? { ...i, radial: true, min: 0.001, max: 0.00175 } : i));
    const r = rejudgeAffectedReading({ reading: reading("stem", [0.4338, 0.4338], [MIC]), toolId: MIC, errors, siblings: [reading("guide", [0.4368, 0.4368], [OTHER])], items, ctx: IN, label });
    const fit = r.places.find((p) => p.itemKey === "clearance")!;
    // 0.0030 diametral = 0.0015 radial, moving ±0.00015.
    expect([fit.value, fit.low, fit.high]).toEqual([0.0015, 0.00135, 0.00165]);
  });

  it("a feeler leaf found thinner than the thickness used proves less: the go/no-go verdict could change", () => {
    const ring: ItemRules = { ...base, key: "ring", label: "Ring side clearance", kind: "feeler", min: 0.0045, max: 0.006, repeat: 1 };
    const go = { leaves: [{ id: "g", label: "0.005", thickness: 0.0046 }], thickness: 0.0046 };
    const noGo = { leaves: [{ id: "n", label: "0.006", thickness: 0.006 }], thickness: 0.006 };
    const r = reading("ring", [], ["set"], { index: 1, feeler: { mode: "go_no_go", go, noGo, goEntered: true, noGoEntered: false, gap: null, why: null } });
    // The go leaf was 0.0046 at its last calibration and is found 0.0044 now (−0.0006 on 0.005): it may have been under 0.0045.
    const worn = rejudgeAffectedReading({ reading: r, toolId: "set", errors: { unit: "in", points: [{ nominal: 0.005, error: -0.0006, uncertainty: null, elementId: "g" }, { nominal: 0.006, error: 0, uncertainty: null, elementId: "n" }] }, siblings: [], items: [ring], ctx: IN, label });
    expect(worn.quantity).toBe("gap");
    expect(worn.verdictCouldChange).toBe(true);
    // Found as used (no drift, no error): the check stands.
    const sound = rejudgeAffectedReading({ reading: r, toolId: "set", errors: { unit: "in", points: [{ nominal: 0.0046, error: 0, uncertainty: null, elementId: "g" }, { nominal: 0.006, error: 0, uncertainty: null, elementId: "n" }] }, siblings: [], items: [ring], ctx: IN, label });
    expect(sound.verdictCouldChange).toBe(false);
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
