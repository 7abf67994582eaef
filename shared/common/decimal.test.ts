import { describe, expect, it } from "vitest";
import { Decimal, dec, decOrNull, num } from "./decimal";

describe("exact lengths", () => {
  it("a reading typed as 1.1250 is exactly 1.125, not its binary neighbour", () => {
    expect(dec(1.125).equals(new Decimal("1.125"))).toBe(true);
    expect(dec(0.1).toString()).toBe("0.1");
  });

  it("25.021 − 24.980 is exactly 0.041 (reference-values.md, limits and fits: binary floating point gives 0.04100000000000037)", () => {
    expect(25.021 - 24.98).not.toBe(0.041);
    expect(dec(25.021).minus(dec(24.98)).toString()).toBe("0.041");
    expect(num(dec(25.021).minus(24.98))).toBe(0.041);
  });

  it("text and Decimals pass through unchanged", () => {
    expect(dec(" 0.0001 ").toString()).toBe("0.0001");
    const d = new Decimal("2.54");
    expect(dec(d)).toBe(d);
    expect(dec(1e-7).toString()).toBe("1e-7");
  });

  it("a value that is not a number is refused rather than judged", () => {
    expect(() => dec(Number.NaN)).toThrow(RangeError);
    expect(() => dec(Infinity)).toThrow(RangeError);
    expect(() => dec("")).toThrow(RangeError);
    expect(() => dec("abc")).toThrow();
  });

  it("an absent optional limit stays absent", () => {
    expect(decOrNull(null)).toBeNull();
    expect(decOrNull(undefined)).toBeNull();
    expect(decOrNull(0)!.isZero()).toBe(true);
  });
});
