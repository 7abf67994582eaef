import { describe, expect, it } from "vitest";
import { checkPointOutsideRange } from "./check-range";

// Common practice, no source: a check point must be a size the tool can read.
const mic12 = { assetTag: "MIC-0106", unit: "in", rangeMin: "1", rangeMax: "2" };

describe("a check point outside the tool's range is refused", () => {
  it("nominal 0 on a 1–2 in micrometer is refused and says it needs a setting standard", () => {
    const m = checkPointOutsideRange(0, mic12);
    expect(m).toMatch(/outside the range of MIC-0106 \(1–2 in\)/);
    expect(m).toMatch(/setting standard of 1 in/);
  });
  it("the ends of the range are inside it", () => {
    expect(checkPointOutsideRange(1, mic12)).toBeNull();
    expect(checkPointOutsideRange("2.0000", mic12)).toBeNull();
    expect(checkPointOutsideRange(2.0001, mic12)).not.toBeNull();
  });
  it("nominal 0 on a 0–1 in micrometer is the ordinary zero check", () => {
    expect(checkPointOutsideRange(0, { ...mic12, rangeMin: 0, rangeMax: 1 })).toBeNull();
  });
});
