import { describe, expect, it } from "vitest";
import { Decimal } from "../common/decimal";
import { errorBand, judgeOverBand, nearestPoint, type ErrorVariable, type SourceMap } from "./rejudge";
import type { Check } from "../inspection/judging";

// The error of a tool found out of tolerance is known only at its check points; between them it is not. The band
// applied to every reading it took is the largest |error| (plus that point's U) at any check point in its range, with
// both signs (conservative; common practice). Check values are hand-worked with exact decimals.
const d = (x: number | string) => new Decimal(String(x));
const check = (value: string, min: string | null, max: string | null, coef = -1): Check => ({
  label: "direction 1",
  value: d(value),
  newMin: min == null ? null : d(min),
  newMax: max == null ? null : d(max),
  min: min == null ? null : d(min),
  max: max == null ? null : d(max),
  shown: "length",
  sensitivity: [{ key: "reading:j#1", coef: d(coef) }],
});
const tool = (E: string): { vars: Map<string, ErrorVariable>; sources: SourceMap } => ({
  vars: new Map([["tool", { id: "tool", halfWidth: d(E), likely: null }]]),
  sources: new Map([["reading:j#1", { variable: "tool", factor: d(1) }]]),
});

describe("the error band of a tool", () => {
  const points = [
    { nominal: 0.105, error: 0, uncertainty: null },
    { nominal: 0.5, error: 0.0003, uncertainty: 0.00002 },
    { nominal: 1.0, error: -0.0001, uncertainty: null },
  ];

  it("is the largest |error| plus its U at any check point: +0.0003 with U 0.00002 gives ±0.00032 in", () => {
    expect(errorBand({ unit: "in", points })!.halfWidth.toString()).toBe("0.00032");
  });

  it("counts only the check points in the tool's range", () => {
    expect(errorBand({ unit: "in", points, range: { min: 0.75, max: 1 } })!.halfWidth.toString()).toBe("0.0001");
  });

  it("is unknown without points (a lost tool)", () => {
    expect(errorBand({ unit: "in", points: null })).toBeNull();
  });

  it("the most likely error is the one at the check point nearest the size; halfway, the larger", () => {
    expect(nearestPoint(points, 0.45)?.error).toBe(0.0003);
    expect(nearestPoint([{ nominal: 0.5, error: 0.0001 }, { nominal: 1, error: -0.0004 }], 0.75)?.error).toBe(-0.0004);
  });
});

describe("could the verdict have changed over the band?", () => {
  it("a diameter read 0.4336 against a 0.4335 minimum, with a ±0.0003 band, could have been 0.4333: it could change", () => {
    const { vars, sources } = tool("0.0003");
    const j = judgeOverBand([check("0.4336", "0.4335", "0.434")], vars, sources);
    expect(j.verdictNow).toBe("within_limits");
    expect(j.couldChange).toBe(true);
    expect([j.spans[0].low.toString(), j.spans[0].high.toString()]).toEqual(["0.4333", "0.4339"]);
    expect(j.worstMargin!.toString()).toBe("-0.0002");
  });

  it("both signs count: an error found −0.0002 would move 0.4337 up, but +0.0002 takes it to 0.4335, on the limit — it holds; 0.4336 does not", () => {
    const { vars, sources } = tool("0.0002");
    expect(judgeOverBand([check("0.4337", "0.4335", "0.434")], vars, sources).couldChange).toBe(false);
    expect(judgeOverBand([check("0.4336", "0.4335", "0.434")], vars, sources).couldChange).toBe(true);
  });

  it("outside to inside counts too: 0.4332, 0.0003 under the minimum, could have been 0.4335 on it", () => {
    const { vars, sources } = tool("0.0003");
    const j = judgeOverBand([check("0.4332", "0.4335", "0.434")], vars, sources);
    expect(j.verdictNow).toBe("outside_limits");
    expect(j.couldChange).toBe(true);
    expect(judgeOverBand([check("0.4331", "0.4335", "0.434")], vars, sources).couldChange).toBe(false);
  });

  it("an outside verdict with two readings changes only if one error brings both inside at once", () => {
    const { vars, sources } = tool("0.0003");
    // 0.4331 needs e ≤ −0.0004 to come up to 0.4335; 0.4341 needs e ≥ +0.0001 to come down: no single error does both.
    const two = [check("0.4331", "0.4335", "0.434"), { ...check("0.4341", "0.4335", "0.434"), label: "direction 2" }];
    expect(judgeOverBand(two, vars, sources).couldChange).toBe(false);
  });

  it("a quantity the tool does not move cannot change (out-of-round read with one tool)", () => {
    const { vars, sources } = tool("0.0003");
    const oor: Check = { ...check("0.0015", null, "0.0012"), label: "out-of-round", sensitivity: [] };
    expect(judgeOverBand([oor], vars, sources)).toMatchObject({ verdictNow: "outside_limits", couldChange: false });
  });
});
