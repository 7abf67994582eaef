import { describe, expect, it } from "vitest";
import { clearanceAt, judgeSizeReading, resolutionFlag, temperatureCorrection, toTableUnit, verdictText } from "./check-sheet";

const pin = { kind: "journal" as const, min: 1.124, max: 1.125, serviceableMin: null, serviceableMax: null };
const clearance = { kind: "clearance" as const, min: 0.001, max: 0.0045, serviceableMin: null, serviceableMax: 0.005, boreKey: "bore", journalKey: "pin" };

describe("check sheet arithmetic", () => {
  it("journal 1.1250/1.1247 has size 1.1247 and out-of-round 0.0003 (common practice)", () => {
    expect(judgeSizeReading(pin, [1.125, 1.1247])).toMatchObject({ size: 1.1247, outOfRound: 0.0003, judgement: { verdict: "within_limits" } });
  });

  it("a clearance waits for both sizes, then is bore − journal: 1.1273 − 1.1247 = 0.0026 in (common practice)", () => {
    const sizes: Record<string, number> = { pin: 1.1247 };
    const find = (k: string, index: number) => (k in sizes ? { itemKey: k, index, size: sizes[k] } : undefined);
    expect(clearanceAt(clearance, 1, find).verdict).toBe("pending");
    sizes.bore = 1.1273;
    const c = clearanceAt(clearance, 1, find);
    expect(c.clearance).toBe(0.0026);
    expect(verdictText(clearance, c.judgement)).toBe("Within new limits");
  });

  it("28.575 mm read on a metric tool is exactly 1.125 in on an inch table (1 in = 25.4 mm, NIST SP 811)", () => {
    expect(toTableUnit([28.575], "mm", "in")[0].toString()).toBe("1.125");
  });

  it("a 0.001 mm micrometer on a 0.02 mm tolerance passes the rule of ten; 0.005 mm does not (AIAG MSA)", () => {
    const item = { kind: "journal" as const, min: 24.98, max: 25.0, serviceableMin: null, serviceableMax: null };
    expect(resolutionFlag(item, 0.002, "mm", "mm")).toBe(false);
    expect(resolutionFlag(item, 0.005, "mm", "mm")).toBe(true);
  });

  it("a 7075 aluminium journal of 50 mm read with a steel micrometer, both at 25 °C, reads 2.975 µm large (JCGM 100:2008 H.1)", () => {
    expect(temperatureCorrection({ size: 50, partMaterial: "aluminium_7075", temperatureC: 25 })).toMatchObject({ correction: -0.002975, correctedSize: 49.997025 });
  });

  it("a steel part of 50 mm at 25 °C read with a tool at 20 °C is 2.875 µm long (ISO 1; ΔL = L·α·(t − 20))", () => {
    expect(temperatureCorrection({ size: 50, partMaterial: "steel", temperatureC: 25, toolTemperatureC: 20 })?.correction).toBe(-0.002875);
  });
});
