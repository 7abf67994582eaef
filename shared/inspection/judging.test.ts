import { describe, expect, it } from "vitest";
import { judgeFit, judgeReading, judgeRow, judgeSize, judgeTaper, type ItemRules, type Judged, type JudgingContext, type ReadingEvidence, type SizePlace } from "./judging";

// Hand-worked examples with exact decimals. Limits are demo values (invented) unless a source is named.
const IN: JudgingContext = { tableUnit: "in", tableExpansionPerK: null };
const MM: JudgingContext = { tableUnit: "mm", tableExpansionPerK: null };
const item = (over: Partial<ItemRules> & Pick<ItemRules, "key" | "kind">): ItemRules => ({
  label: over.key,
  min: null,
  max: null,
  serviceableMin: null,
  serviceableMax: null,
  boreKey: null,
  journalKey: null,
  stationKeys: null,
  radial: false,
  outOfRoundMax: null,
  expansionPerK: null,
  directions: 2,
  repeat: 1,
  ...over,
});
const ev = (itemKey: string, values: number[], over: Partial<ReadingEvidence> = {}): ReadingEvidence => ({ itemKey, index: 1, unit: "in", values, ...over });
const size = (it: ItemRules, values: number[], ctx = IN, over: Partial<ReadingEvidence> = {}) => judgeSize(it, ev(it.key, values, over), ctx) as Judged<SizePlace>;

describe("every two-point reading is judged (ISO 14405-1 default two-point size; ISO 8015 — from memory)", () => {
  const journal = item({ key: "journal", kind: "journal", min: 1.123, max: 1.125 });

  it("a journal limited to 1.1230–1.1250 read 1.1252 and 1.1245 is outside: direction 1 is 0.0002 over the maximum", () => {
    const j = size(journal, [1.1252, 1.1245]).view;
    expect(j.verdict).toBe("outside_limits");
    // The size (smallest journal reading) stays 1.1245 for wear and clearances, but does not hide the other reading.
    expect(j.size).toBe(1.1245);
    expect(j.directions[0]).toMatchObject({ direction: 1, value: 1.1252, verdict: "outside_limits", beyond: { side: "max", limit: 1.125, by: 0.0002 } });
    expect(j.directions[1]).toMatchObject({ verdict: "within_limits", beyond: null });
    expect(j.text).toBe("Outside new limits: direction 1 1.1252 is 0.0002 over the maximum 1.1250");
  });

  it("readings on the limits are within them; a tenth beyond is outside (exact decimals)", () => {
    expect(size(journal, [1.125, 1.123]).view.verdict).toBe("within_limits");
    expect(size(journal, [1.125, 1.1229]).view.directions[1].beyond).toMatchObject({ side: "min", by: 0.0001 });
  });

  it("a bore worn past its new maximum but inside the serviceable maximum is serviceable, and says so", () => {
    const bore = item({ key: "bore", kind: "bore", min: 1.1265, max: 1.128, serviceableMax: 1.1295 });
    const j = size(bore, [1.1293, 1.1291]).view;
    expect(j).toMatchObject({ verdict: "within_limits", band: "serviceable", text: "Within serviceable limits (worn beyond new)" });
    expect(size(bore, [1.1296, 1.129]).view.text).toBe("Outside serviceable limits: direction 1 1.1296 is 0.0001 over the serviceable maximum 1.1295");
  });
});

describe("out-of-round and taper (common practice, handbook examples)", () => {
  const top = item({ key: "top", kind: "bore", min: 5.25, max: 5.252, outOfRoundMax: 0.0012 });
  const bottom = item({ key: "bottom", kind: "bore", min: 5.25, max: 5.252, outOfRoundMax: 0.0012 });
  const taper = item({ key: "taper", kind: "taper", stationKeys: ["top", "bottom"], max: 0.0012 });

  it("out-of-round is largest − smallest at one station: 5.2519 − 5.2504 = 0.0015, 0.0003 over a 0.0012 limit, though both sizes are inside", () => {
    const j = size(top, [5.2519, 5.2504]).view;
    expect(j.outOfRound).toBe(0.0015);
    expect(j.directions.every((d) => d.verdict === "within_limits")).toBe(true);
    expect(j).toMatchObject({ verdict: "outside_limits", outOfRoundVerdict: "outside_limits", outOfRoundBeyond: 0.0003 });
    expect(j.text).toContain("out-of-round 0.0015 is 0.0003 over the maximum 0.0012");
  });

  it("a worn part failing a limit it has no serviceable figure for is \"outside limits\", naming the limit", () => {
    const worn = item({ key: "j", kind: "journal", min: 0.8745, max: 0.875, serviceableMin: 0.874 });
    expect(size(worn, [0.8751, 0.8746]).view.text).toBe("Outside limits: direction 1 0.8751 is 0.0001 over the maximum 0.8750");
  });

  it("an out-of-round on its limit is within it", () => {
    expect(size(top, [5.2516, 5.2504]).view.outOfRoundVerdict).toBe("within_limits");
  });

  it("taper is the difference between stations read in the same direction: 5.2519 − 5.2503 = 0.0016 over 0.0012 is outside", () => {
    const a = size(top, [5.2519, 5.2517]);
    const b = size(bottom, [5.2503, 5.2502]);
    const t = judgeTaper(taper, a, b, IN, 1, ["top", "bottom"]).view;
    expect(t.directions).toEqual([
      { direction: 1, a: 5.2519, b: 5.2503, difference: 0.0016 },
      { direction: 2, a: 5.2517, b: 5.2502, difference: 0.0015 },
    ]);
    expect(t).toMatchObject({ taper: 0.0016, verdict: "outside_limits" });
    expect(t.text).toBe("Outside new limits: taper, direction 1 0.0016 is 0.0004 over the maximum 0.0012; taper, direction 2 0.0015 is 0.0003 over the maximum 0.0012");
  });

  it("a taper either way (a bell-mouth or a choke) counts by its size", () => {
    const t = judgeTaper(taper, size(top, [5.2503, 5.2502]), size(bottom, [5.2512, 5.2503]), IN, 1, ["top", "bottom"]).view;
    expect(t.taper).toBe(0.0009);
    expect(t.verdict).toBe("within_limits");
  });

  it("taper waits for both stations", () => {
    const items = [top, bottom, taper];
    const only = (k: string) => (k === "top" ? ev("top", [5.2512, 5.2509]) : undefined);
    expect(judgeRow(items, taper, 1, only, IN).view).toMatchObject({ kind: "pending", verdict: "pending" });
  });
});

describe("both fits of a clearance (common practice): loosest against the maximum, tightest against the minimum", () => {
  const pin = item({ key: "pin", kind: "journal", min: 1.12, max: 1.13 });
  const bore = item({ key: "bore", kind: "bore", min: 1.12, max: 1.13 });
  const fit = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: 0.001, max: 0.003 });

  it("journal 1.1250/1.1247 and bore 1.1271/1.1273 give loosest 0.0026 and tightest 0.0021 in (reference-values.md, shop practice)", () => {
    const f = judgeFit(fit, size(bore, [1.1271, 1.1273]), size(pin, [1.125, 1.1247]), IN, 1).view;
    expect(f.loosest).toMatchObject({ value: 0.0026, boreValue: 1.1273, journalValue: 1.1247, verdict: "within_limits" });
    expect(f.tightest).toMatchObject({ value: 0.0021, boreValue: 1.1271, journalValue: 1.125, verdict: "within_limits" });
  });

  it("bore 1.1256/1.1270 on journal 1.1250/1.1243: loosest 0.0027 passes 0.0030, but the tightest 0.0006 is 0.0004 under the 0.0010 minimum", () => {
    const f = judgeFit(fit, size(bore, [1.1256, 1.127]), size(pin, [1.125, 1.1243]), IN, 1).view;
    expect(f.loosest).toMatchObject({ value: 0.0027, verdict: "within_limits" });
    expect(f.tightest).toMatchObject({ value: 0.0006, verdict: "outside_limits", beyond: { side: "min", limit: 0.001, by: 0.0004 } });
    expect(f.verdict).toBe("outside_limits");
    expect(f.text).toBe("Outside new limits: tightest fit 0.0006 loose is 0.0004 under the minimum 0.0010 loose");
  });

  it("25 H7/g6 at its extremes: hole 25.000/25.021 on shaft 24.980/24.993 gives 0.041 and 0.007 mm, both on the limits and within (ISO 286-2)", () => {
    const hole = item({ key: "bore", kind: "bore", min: 25.0, max: 25.021 });
    const shaft = item({ key: "pin", kind: "journal", min: 24.98, max: 24.993 });
    const g6 = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: 0.007, max: 0.041 });
    const f = judgeFit(g6, size(hole, [25.0, 25.021], MM, { unit: "mm" }), size(shaft, [24.98, 24.993], MM, { unit: "mm" }), MM, 1).view;
    // Binary floating point gives 25.021 − 24.980 = 0.04100000000000037, over the limit; exact decimals keep it on it.
    expect(f.loosest).toMatchObject({ value: 0.041, verdict: "within_limits", margin: 0 });
    expect(f.tightest).toMatchObject({ value: 0.007, verdict: "within_limits", margin: 0 });
  });

  it("25 H7/k6 is a transition fit: hole 25.000 on shaft 25.015 is 0.015 mm interference, on the −0.015 limit (ISO 286-2)", () => {
    const hole = item({ key: "bore", kind: "bore", min: 25.0, max: 25.021 });
    const shaft = item({ key: "pin", kind: "journal", min: 25.002, max: 25.015 });
    const k6 = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: -0.015, max: 0.019 });
    const f = judgeFit(k6, size(hole, [25.0, 25.0], MM, { unit: "mm" }), size(shaft, [25.015, 25.002], MM, { unit: "mm" }), MM, 1).view;
    expect(f.tightest).toMatchObject({ value: -0.015, verdict: "within_limits" });
    expect(f.loosest).toMatchObject({ value: -0.002, verdict: "within_limits" });
  });

  it("RC4 at 1.000 in: hole 1.0000–1.0012 on shaft 0.9984–0.9992 spans 0.0008 to 0.0028 in (ANSI B4.1-1967 (R2009) as printed in Machinery's Handbook)", () => {
    const hole = item({ key: "bore", kind: "bore", min: 1.0, max: 1.0012 });
    const shaft = item({ key: "pin", kind: "journal", min: 0.9984, max: 0.9992 });
    const rc4 = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: 0.0008, max: 0.0028 });
    const f = judgeFit(rc4, size(hole, [1.0, 1.0012]), size(shaft, [0.9984, 0.9992]), IN, 1).view;
    expect([f.tightest.value, f.loosest.value]).toEqual([0.0008, 0.0028]);
    expect(f.verdict).toBe("within_limits");
  });

  it("a clearance waits for both sizes", () => {
    const items = [pin, bore, fit];
    expect(judgeRow(items, fit, 1, (k) => (k === "pin" ? ev("pin", [1.125, 1.1247]) : undefined), IN).view.verdict).toBe("pending");
    const both = judgeRow(items, fit, 1, (k) => (k === "pin" ? ev("pin", [1.125, 1.1247]) : ev("bore", [1.1271, 1.1273])), IN).view;
    expect(both).toMatchObject({ kind: "fit", verdict: "within_limits" });
  });
});

describe("radial clearances: half the diametral one where the table says radial (common practice)", () => {
  const pin = item({ key: "pin", kind: "journal", min: 1.12, max: 1.13 });
  const bore = item({ key: "bore", kind: "bore", min: 1.12, max: 1.13 });
  const radial = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: 0.0005, max: 0.0015, radial: true });

  it("1.1273 − 1.1247 = 0.0026 diametral is 0.0013 radial, inside 0.0005–0.0015 radial", () => {
    const f = judgeFit(radial, size(bore, [1.1273, 1.1273]), size(pin, [1.1247, 1.1247]), IN, 1).view;
    expect(f).toMatchObject({ basis: "radial", verdict: "within_limits" });
    expect(f.loosest).toMatchObject({ value: 0.0013, diametral: 0.0026 });
  });

  it("0.0009 diametral passes a 0.0005 minimum only when read as diametral: as radial, 0.00045 is 0.00005 under it", () => {
    const f = judgeFit(radial, size(bore, [1.1256, 1.1256]), size(pin, [1.1247, 1.1247]), IN, 1).view;
    expect(f.tightest).toMatchObject({ value: 0.00045, diametral: 0.0009, verdict: "outside_limits", beyond: { by: 0.00005 } });
    expect(f.text).toContain("tightest fit (radial) 0.00045 loose is 0.00005 under the minimum 0.0005 loose");
  });
});

describe("lengths judged at 20 °C when a part temperature and an expansion coefficient are known (ISO 1)", () => {
  it("a 7075 journal of 50 mm read with a steel micrometer, both at 25 °C, reads 2.975 µm large (JCGM 100:2008 H.1; α from Callister App. B)", () => {
    const journal = item({ key: "j", kind: "journal", min: 49.9, max: 50.1, expansionPerK: 0.0000234 });
    const j = size(journal, [50, 50], MM, { unit: "mm", temperatureC: 25 }).view;
    expect(j.thermal).toMatchObject({ correction: -0.002975, source: "item", partTemperatureC: 25, toolTemperatureC: 25 });
    expect(j.size).toBe(49.997025);
    expect(j.rawSize).toBe(50);
  });

  it("the verdict is made on the corrected length: 50.002 mm at 25 °C is 49.999024881 mm at 20 °C, inside a 50.000 maximum", () => {
    // 50.002 × (1 − (23.4 − 11.5) × 10⁻⁶ × 5) = 50.002 − 0.002975119 = 49.999024881 (arithmetic on JCGM 100 H.1)
    const journal = item({ key: "j", kind: "journal", min: 49.99, max: 50.0, expansionPerK: 0.0000234 });
    const warm = size(journal, [50.002, 50.001], MM, { unit: "mm", temperatureC: 25 }).view;
    expect(warm.directions[0]).toMatchObject({ raw: 50.002, inTableUnit: 50.002, value: 49.999024881, verdict: "within_limits" });
    expect(warm.verdict).toBe("within_limits");
    expect(warm.text).toBe("Within new limits (at 20 °C)");
    // The same values with no temperature are judged as read: outside.
    expect(size(journal, [50.002, 50.001], MM, { unit: "mm" }).view.verdict).toBe("outside_limits");
  });

  it("a steel part at 25 °C read with a tool at 20 °C is 2.875 µm long per 50 mm (ΔL = L·α·(t − 20), α 11.5 × 10⁻⁶ /K; ISO 1, NIST)", () => {
    const steel = item({ key: "j", kind: "journal", min: 49.9, max: 50.1 });
    const j = size(steel, [50, 50], { tableUnit: "mm", tableExpansionPerK: 0.0000115 }, { unit: "mm", temperatureC: 25, toolTemperatureC: 20 }).view;
    expect(j.thermal).toMatchObject({ correction: -0.002875, source: "table" });
  });

  it("without a coefficient from the item, the table or the reading's material, nothing is corrected", () => {
    const plain = item({ key: "j", kind: "journal", min: 49.9, max: 50.1 });
    expect(size(plain, [50, 50], MM, { unit: "mm", temperatureC: 25 }).view.thermal).toBeNull();
    expect(size(plain, [50, 50], MM, { unit: "mm", temperatureC: 25, partMaterial: "aluminium_7075" }).view.thermal).toMatchObject({ source: "reading", material: "aluminium_7075", correction: -0.002975 });
  });

  it("28.575 mm read on a metric micrometer is exactly 1.125 in on an inch table (1 in = 25.4 mm exactly, NIST SP 811 App. B)", () => {
    const j = item({ key: "j", kind: "journal", min: 1.124, max: 1.125 });
    const v = size(j, [28.575, 28.575], IN, { unit: "mm" }).view;
    expect(v.directions[0]).toMatchObject({ raw: 28.575, rawUnit: "mm", value: 1.125, verdict: "within_limits" });
  });
});

describe("visual items", () => {
  it("serviceable or reject, with nothing to compute", () => {
    const v = item({ key: "v", kind: "visual" });
    expect(judgeReading(v, ev("v", [], { visualResult: "reject" }), IN).view).toMatchObject({ verdict: "outside_limits", text: "Reject" });
  });
});

describe("a sheet judges each reading once", () => {
  const pin = item({ key: "pin", kind: "journal", min: 1.124, max: 1.125 });
  const bore = item({ key: "bore", kind: "bore", min: 1.1265, max: 1.128 });
  const fit = item({ key: "fit", kind: "clearance", boreKey: "bore", journalKey: "pin", min: 0.001, max: 0.0045 });
  const items = [pin, bore, fit];
  const evidence: Record<string, ReadingEvidence> = { pin: ev("pin", [1.125, 1.1247]), bore: ev("bore", [1.1271, 1.1273]) };

  it("a fit worked out from its sides' stored judgements is the fit judged from the readings: loosest 1.1273 − 1.1247 = 0.0026 (demo limits)", () => {
    const fromReadings = judgeRow(items, fit, 1, (k) => evidence[k], IN);
    // Stored views round-trip through JSON, as the database keeps them.
    const stored = new Map(["pin", "bore"].map((k) => [k, JSON.parse(JSON.stringify(judgeReading(items.find((i) => i.key === k)!, evidence[k], IN).view))]));
    const fromStored = judgeRow(items, fit, 1, () => undefined, IN, (k) => (stored.has(k) ? { view: stored.get(k), checks: [] } : undefined));
    expect(fromStored.view).toEqual(fromReadings.view);
    expect(fromStored.view).toMatchObject({ kind: "fit", loosest: { value: 0.0026 }, verdict: "within_limits" });
    // Shown only: a place judged from stored views carries nothing to re-judge with.
    expect(fromStored.checks.every((c) => c.sensitivity.length === 0)).toBe(true);
  });

  it("a saved judgement answers for its own place; without one, the reading is judged", () => {
    const stored = judgeReading(pin, evidence.pin, IN).view;
    expect(judgeRow(items, pin, 1, () => undefined, IN, () => ({ view: stored, checks: [] })).view).toBe(stored);
    expect(judgeRow(items, pin, 1, (k) => evidence[k], IN, () => undefined).view).toMatchObject({ kind: "size", size: 1.1247 });
  });
});
