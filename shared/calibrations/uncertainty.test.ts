import { describe, expect, it } from "vitest";
import stdlibTQuantile from "@stdlib/stats-base-dists-t-quantile";
import { dec } from "../common/decimal";
import {
  combineStandardUncertainties,
  COVERAGE_PROBABILITY,
  coverageFactor,
  effectiveDegreesOfFreedom,
  expandedUncertainty,
  experimentalStandardDeviation,
  pointBudget,
  rectangularStandardUncertainty,
  resolutionStandardUncertainty,
  roundUncertainty,
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

  it("repeated readings give the experimental standard deviation with n − 1 (GUM 4.2.2): 0.5000, 0.5001, 0.5002 in → s = 0.0001 in", () => {
    expect(experimentalStandardDeviation(["0.5000", "0.5001", "0.5002"])).toBeCloseTo(0.0001, 15);
    expect(() => experimentalStandardDeviation([0.5])).toThrow(RangeError);
  });

  it("U is stated with two significant digits rounded up (GUM 7.2.6), ignoring binary noise", () => {
    expect(roundUncertainty(5.7874e-5)).toBe(0.000058);
    expect(roundUncertainty(0.000012)).toBe(0.000012);
    expect(roundUncertainty(2.0000000000000002e-5)).toBe(0.00002);
    expect(roundUncertainty(0)).toBe(0);
  });
});

describe("coverage factor from the t-distribution (GUM G.3, Table G.2)", () => {
  it("for about 95 % the product uses p = 95.45 %, where k is exactly 2 with many degrees of freedom (GUM Table G.2; api.md U at k = 2)", () => {
    expect(COVERAGE_PROBABILITY).toBeCloseTo(0.9545, 4);
    expect(coverageFactor(null)).toBeCloseTo(2, 10);
  });

  it("t-values of GUM Table G.2 for p = 95.45 %: ν = 1 → 13.97, 5 → 2.65, 10 → 2.28, 20 → 2.13, 50 → 2.05; jstat cross-checked with @stdlib", () => {
    for (const [nu, t] of [[1, 13.97], [5, 2.65], [10, 2.28], [20, 2.13], [50, 2.05]] as const) {
      expect(coverageFactor(nu)).toBeCloseTo(t, 2);
      expect(coverageFactor(nu)).toBeCloseTo(stdlibTQuantile((1 + COVERAGE_PROBABILITY) / 2, nu), 6);
    }
  });

  it("t₉₅(16) = 2.12 (GUM Table G.2, as JCGM 100 H.1 uses it)", () => {
    expect(coverageFactor(16, 0.95)).toBeCloseTo(2.12, 2);
  });
});

describe("Welch–Satterthwaite effective degrees of freedom (GUM G.4.1)", () => {
  it("components with infinite degrees of freedom give an infinite ν_eff", () => {
    expect(effectiveDegreesOfFreedom([{ u: 1, dof: null }, { u: 2, dof: null }])).toBeNull();
  });

  it("one Type A component alone keeps its own n − 1", () => {
    expect(effectiveDegreesOfFreedom([{ u: 3, dof: 4 }])).toBe(4);
  });

  it("JCGM 100 H.1 end gauge: the six contributions and their ν give ν_eff = 16 (JCGM 100:2008 H.1.6; ν of each term from memory)", () => {
    const parts = [
      { u: 25, dof: 18 }, // calibration of the standard
      { u: 5.8, dof: 24 }, // repeated observations
      { u: 3.9, dof: 5 }, // random effects of the comparator
      { u: 6.7, dof: 8 }, // systematic effects of the comparator
      { u: 50e6 * 0.1 * (1e-6 / Math.sqrt(3)), dof: 50 }, // l·θ·u(δα), nm
      { u: 50e6 * 11.5e-6 * (0.05 / Math.sqrt(3)), dof: 2 }, // l·α·u(δθ), nm
    ];
    expect(effectiveDegreesOfFreedom(parts)).toBe(16);
  });
});

describe("the uncertainty budget of a calibration point", () => {
  it("reproduces JCGM 100 H.1: a 50 mm end gauge against a standard with U = 0.075 µm (k = 3), comparator terms, θ = −0.1 °C, δθ within ± 0.05 °C → u_c = 32 nm (JCGM 100:2008 H.1)", () => {
    const b = pointBudget({
      unit: "mm",
      standards: [{ kind: "certificate", source: "Reference end gauge", expandedUncertainty: 0.000075, coverageFactor: 3, dof: 18 }],
      resolution: 0,
      lengthMm: 50,
      temperatureC: 19.9,
      temperatureVariationC: 0.05,
      others: [
        { source: "Repeated observations of the comparator (5 of a pooled 25)", u: 5.8e-6, dof: 24 },
        { source: "Random effects of the comparator", u: 3.9e-6, dof: 5 },
        { source: "Systematic effects of the comparator", u: 6.7e-6, dof: 8 },
      ],
    });
    const row = (kind: string) => b.components.find((c) => c.kind === kind)!;
    expect(row("standard").contribution * 1e6).toBeCloseTo(25, 6);
    // l·|θ|·u(δα) = 50 mm · 0.1 K · (1e-6/√3) /K = 2.9 nm; l·α_s·u(δθ) = 50 mm · 11.5e-6 /K · 0.05/√3 K = 16.6 nm (JCGM 100 H.1.3.5, H.1.3.6)
    expect(row("temperature_offset").contribution * 1e6).toBeCloseTo(2.9, 1);
    expect(row("temperature_variation").contribution * 1e6).toBeCloseTo(16.6, 1);
    expect(Math.round(b.combined * 1e6)).toBe(32);
    // l = l_s + d = 50.000 623 mm + 215 nm = 50.000 838 mm (JCGM 100:2008 H.1.5), exact in decimals.
    expect(dec("50.000623").plus("0.000215").toString()).toBe("50.000838");
  });

  it("a micrometer point: certificate U/k, resolution d/√12, repeatability s/√n with n − 1 degrees of freedom, the departure from 20 °C through Δα and the stated variation, all added (GUM 4.2.3, 4.3.7, F.2.2.1, 5.1.2; JCGM 100 H.1 model)", () => {
    const b = pointBudget({
      unit: "mm",
      standards: [{ kind: "certificate", source: "Block 25 mm", expandedUncertainty: 0.0001, coverageFactor: 2, dof: null }],
      resolution: 0.001,
      repeatReadings: ["25.001", "25.002", "25.001", "25.002"],
      lengthMm: 25,
      temperatureC: 22,
      temperatureVariationC: 0.5,
    });
    expect(b.components.map((c) => c.kind)).toEqual(["standard", "resolution", "repeatability", "temperature_offset", "temperature_variation"]);
    const [std, res, rep, off, vari] = b.components;
    expect(std.contribution).toBeCloseTo(0.00005, 15);
    expect(res.contribution).toBeCloseTo(0.001 / Math.sqrt(12), 15);
    // s = 0.000577 mm of four readings; the mean's s/√4, ν = 3
    expect(rep).toMatchObject({ type: "A", dof: 3 });
    expect(rep.contribution).toBeCloseTo(experimentalStandardDeviation(["25.001", "25.002", "25.001", "25.002"]) / 2, 15);
    // 25 mm · 2 K · 1e-6/√3 and 25 mm · 11.5e-6 · 0.5/√3: the departure and the variation both count, neither replaces the other
    expect(off.contribution).toBeCloseTo((25 * 2 * 1e-6) / Math.sqrt(3), 15);
    expect(vari.contribution).toBeCloseTo((25 * 11.5e-6 * 0.5) / Math.sqrt(3), 15);
    expect(b.combined).toBeCloseTo(combineStandardUncertainties(b.components.map((c) => c.contribution)), 15);
    // Only the repeatability has finite ν: ν_eff = u_c⁴ / (u_rep⁴ / 3), and k follows from the t-distribution
    const nu = Math.floor(b.combined ** 4 / (rep.contribution ** 4 / 3));
    expect(b.effectiveDof).toBe(nu);
    expect(b.k).toBeCloseTo(stdlibTQuantile((1 + COVERAGE_PROBABILITY) / 2, nu), 6);
    expect(b.expanded).toBeCloseTo(b.k * b.combined, 15);
  });

  it("a block with no certified value counts its grade tolerance as a rectangular distribution (GUM 4.3.7; ISO 3650 te)", () => {
    const b = pointBudget({ unit: "mm", standards: [{ kind: "grade", source: "Block 7.7 mm, grade 0", halfWidth: 0.00012 }], resolution: 0, lengthMm: 7.7 });
    expect(b.components[0]).toMatchObject({ kind: "standard_grade", distribution: "rectangular" });
    expect(b.components[0].contribution).toBeCloseTo(0.00012 / Math.sqrt(3), 15);
  });

  it("an inch tool's budget stays in inches: the thermal terms are worked in millimetres and converted exactly", () => {
    const b = pointBudget({ unit: "in", standards: [], resolution: 0, lengthMm: 25.4, temperatureC: 30, alphaDiffHalfWidthPerK: 1e-6 });
    // 25.4 mm × 1e-6 × 10 K = 0.000254 mm = 0.00001 in
    expect(b.components.find((c) => c.kind === "temperature_offset")!.contribution).toBeCloseTo(0.00001 / Math.sqrt(3), 15);
  });

  it("says which terms it could not evaluate", () => {
    const b = pointBudget({ unit: "in", standards: [], resolution: 0.0001, lengthMm: 12.7 });
    expect(b.notes.join(" ")).toMatch(/repeatability is not evaluated.*No temperature recorded/);
  });

  it("a certificate without a positive coverage factor is refused", () => {
    expect(() => pointBudget({ unit: "mm", standards: [{ kind: "certificate", source: "x", expandedUncertainty: 0.1, coverageFactor: 0, dof: null }], resolution: 0.001, lengthMm: 1 })).toThrow(RangeError);
  });
});
