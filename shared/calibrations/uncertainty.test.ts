import { describe, expect, it } from "vitest";
import {
  combineStandardUncertainties,
  expandedUncertainty,
  rectangularStandardUncertainty,
  resolutionStandardUncertainty,
  uncertaintyBudget,
} from "./uncertainty";

describe("uncertainty components (JCGM 100:2008, GUM)", () => {
  it("a quantity known only within ± a has standard uncertainty a/√3 (GUM 4.3.7)", () => {
    expect(rectangularStandardUncertainty(Math.sqrt(3))).toBeCloseTo(1, 12);
    expect(rectangularStandardUncertainty(-0.003)).toBeCloseTo(0.003 / Math.sqrt(3), 15);
  });

  it("a digital resolution d contributes d/(2√3) ≈ 0.2887·d (GUM F.2.2.1)", () => {
    expect(resolutionStandardUncertainty(1)).toBeCloseTo(0.2887, 4);
    expect(resolutionStandardUncertainty(0.001)).toBeCloseTo(0.001 / (2 * Math.sqrt(3)), 15);
  });

  it("u₁ = 0.05 and u₂ = 0.03 combine to 0.0583095 and U(k=2) = 0.116619 (arithmetic on GUM 5.1.2)", () => {
    const uc = combineStandardUncertainties([0.05, 0.03]);
    expect(uc).toBeCloseTo(0.0583095, 7);
    expect(expandedUncertainty(uc)).toBeCloseTo(0.116619, 6);
  });

  it("the expanded uncertainty is k times the combined one, k = 2 by default (GUM 6.2–6.3; NIST TN 1297)", () => {
    expect(expandedUncertainty(0.5)).toBe(1);
    expect(expandedUncertainty(0.5, 3)).toBe(1.5);
  });
});

describe("uncertainty budget of a calibration point", () => {
  it("without a temperature the budget is the standard's U/k and the resolution of the tool", () => {
    const b = uncertaintyBudget({ standardU: 0.0002, standardK: 2, resolution: 0.001 });
    expect(b.components.map((c) => c.name)).toEqual(["Reference standard (certificate U/k)", "Resolution of the tool under test"]);
    expect(b.components[0].u).toBeCloseTo(0.0001, 15);
    expect(b.combined).toBeCloseTo(Math.hypot(0.0001, 0.001 / (2 * Math.sqrt(3))), 15);
    expect(b.expanded).toBeCloseTo(2 * b.combined, 15);
    expect(b.k).toBe(2);
  });

  it("a point measured away from 20 °C adds a rectangular term of half-width L·|Δα|·|t − 20| (GUM 4.3.7)", () => {
    const b = uncertaintyBudget({ standardU: 0.0002, standardK: 2, resolution: 0.001, lengthMm: 50, tempC: 23, alphaDiffPerK: 2e-6 });
    expect(b.components).toHaveLength(3);
    // 50 mm × 2e-6 /K × 3 K = 0.0003 mm half-width
    expect(b.components[2].u).toBeCloseTo(0.0003 / Math.sqrt(3), 15);
  });

  it("a stated temperature half-width replaces the departure from 20 °C as the span", () => {
    const b = uncertaintyBudget({ standardU: 0, standardK: 2, resolution: 0, lengthMm: 100, tempC: 25, alphaDiffPerK: 1e-6, tempHalfWidthC: 1 });
    expect(b.components[2].u).toBeCloseTo(0.0001 / Math.sqrt(3), 15);
    expect(b.combined).toBeCloseTo(0.0001 / Math.sqrt(3), 15);
  });

  it("an inch tool's budget stays in inches: the temperature term is converted from millimetres", () => {
    const b = uncertaintyBudget({ standardU: 0, standardK: 2, resolution: 0, lengthMm: 25.4, tempC: 30, alphaDiffPerK: 1e-6, unit: "in" });
    // 25.4 mm × 1e-6 × 10 K = 0.000254 mm = 0.00001 in
    expect(b.components[2].u).toBeCloseTo(0.00001 / Math.sqrt(3), 15);
  });

  it("a certificate without a positive coverage factor is refused", () => {
    expect(() => uncertaintyBudget({ standardU: 0.1, standardK: 0, resolution: 0.001 })).toThrow(RangeError);
  });
});
