import { describe, expect, it } from "vitest";
import { all, create } from "mathjs";
import {
  EXPANSION_COEFFICIENTS,
  MM_PER_INCH,
  convertLength,
  correctionTo20C,
  formatLength,
  formatLengthWithUnit,
  thermalExpansion,
} from "./units";

const math = create(all, { number: "BigNumber", precision: 64 });

describe("inch and millimetre", () => {
  it("1 in is 25.4 mm exactly (International yard and pound agreement (1959); NIST SP 811 App. B)", () => {
    expect(MM_PER_INCH.toString()).toBe("25.4");
    expect(convertLength(1, "in", "mm").toString()).toBe("25.4");
  });

  it("mathjs unit conversion agrees that 1 inch = 25.4 mm exactly (library cross-check, general-purpose library)", () => {
    const mm = math.unit(math.bignumber(1), "inch").toNumeric("mm");
    expect(mm.toString()).toBe(convertLength(1, "in", "mm").toString());
  });

  it("a tenth, 0.0001 in, is 2.54 µm (derived from the definition)", () => {
    expect(convertLength(0.0001, "in", "mm").times(1000).toString()).toBe("2.54");
  });

  it("a thousandth, 0.001 in, is 25.4 µm (derived)", () => {
    expect(convertLength(0.001, "in", "mm").times(1000).toString()).toBe("25.4");
  });

  it("a metric reading that is a whole number of ten-thousandths of an inch converts to inch exactly", () => {
    expect(convertLength(28.575, "mm", "in").toString()).toBe("1.125");
    expect(convertLength("25.4", "mm", "in").toString()).toBe("1");
  });

  it("a metric reading converted to inch and back is the same reading", () => {
    const inch = convertLength(25.003, "mm", "in");
    expect(convertLength(inch, "in", "mm").toDecimalPlaces(12).toString()).toBe("25.003");
  });

  it("a length in its own unit is unchanged", () => {
    expect(convertLength(1.1273, "in", "in").toString()).toBe("1.1273");
  });
});

describe("display of lengths", () => {
  it("inch lengths show to the tenth and metric lengths to the micrometre by default", () => {
    expect(formatLength(1.125, "in")).toBe("1.1250");
    expect(formatLength(25, "mm")).toBe("25.000");
    expect(formatLengthWithUnit(0.0026, "in")).toBe("0.0026 in");
  });

  it("display rounding is half up and a value that rounds to nothing shows no minus sign", () => {
    expect(formatLength(0.00005, "in")).toBe("0.0001");
    expect(formatLength(-0.00001, "in")).toBe("0.0000");
    expect(formatLength(1.23456, "mm", 2)).toBe("1.23");
  });
});

describe("temperature (ISO 1:2016 cl. 3: reference temperature 20 °C = 68 °F)", () => {
  it("steel grows 11.5 × 10⁻⁶ per kelvin (NIST Journal of Research (dimensional metrology); ISO 3650 requires (11.5 ± 1.0) × 10⁻⁶ /K for steel blocks (from memory))", () => {
    expect(EXPANSION_COEFFICIENTS.steel.alphaPerK).toBe("11.5e-6");
    expect(EXPANSION_COEFFICIENTS.steel.source).toContain("from memory");
  });

  it("aluminium coefficients are 23.1, 22.9 (2024), 23.4 (7075) and 21.5 (356.0 cast) × 10⁻⁶ /K (NIST J. Res.; Callister, Materials Science and Engineering, App. B)", () => {
    expect(EXPANSION_COEFFICIENTS.aluminium.alphaPerK).toBe("23.1e-6");
    expect(EXPANSION_COEFFICIENTS.aluminium_2024.alphaPerK).toBe("22.9e-6");
    expect(EXPANSION_COEFFICIENTS.aluminium_7075.alphaPerK).toBe("23.4e-6");
    expect(EXPANSION_COEFFICIENTS.aluminium_356_cast.alphaPerK).toBe("21.5e-6");
  });

  it("a 50 mm steel part at 25 °C is 2.875 µm longer than at 20 °C (arithmetic on the above)", () => {
    const dl = thermalExpansion({ length: 50, alphaPerK: EXPANSION_COEFFICIENTS.steel.alphaPerK, tempC: 25 });
    expect(dl.toString()).toBe("0.002875");
  });

  it("a part at the reference temperature needs no correction, and one below it is shorter", () => {
    expect(thermalExpansion({ length: 50, alphaPerK: "11.5e-6", tempC: 20 }).isZero()).toBe(true);
    expect(thermalExpansion({ length: 50, alphaPerK: "11.5e-6", tempC: 15 }).toString()).toBe("-0.002875");
  });

  it("a 50 mm 7075 journal read with a steel micrometer at 25 °C reads 2.975 µm large; the correction is −0.002975 mm (JCGM 100:2008 Annex H.1 model)", () => {
    const c = correctionTo20C({
      length: 50,
      alphaPart: EXPANSION_COEFFICIENTS.aluminium_7075.alphaPerK,
      alphaTool: EXPANSION_COEFFICIENTS.steel.alphaPerK,
      tempC: 25,
    });
    expect(c.toString()).toBe("-0.002975");
  });

  it("a steel part read with a steel micrometer needs no correction at any temperature", () => {
    expect(correctionTo20C({ length: 50, alphaPart: "11.5e-6", alphaTool: "11.5e-6", tempC: 30 }).isZero()).toBe(true);
  });
});
