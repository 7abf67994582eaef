import { describe, expect, it } from "vitest";
import { all, create } from "mathjs";
import stdlibFCdf from "@stdlib/stats-base-dists-f-cdf";
import { anovaGrr, averageRangeFromSummary, averageRangeGrr, D2, D3_FACTOR, distinctCategories, fUpperTail, K1, K2, K3, studyCharts, sumsOfSquares, verdictFor, type StudyGrid } from "./gauge-study-analysis";

// Check values from ../shared/spec/msa-check-values.md, each with its marker as that file gives it:
// [seen] read in the named source; [memory] recalled, not seen — unverified; [derived] recomputed from the data.

/** Rows of [part] → [appraiser] → [trial] from a table written part by part. */
const grid = (rows: number[][][]): StudyGrid => rows;

// A. AIAG MSA 4th ed. GRR example, 10 parts × 3 appraisers × 3 trials (the published example data set; see ../shared/spec/msa-check-values.md, A).
const AIAG = grid([
  [[0.29, 0.41, 0.64], [0.08, 0.25, 0.07], [0.04, -0.11, -0.15]],
  [[-0.56, -0.68, -0.58], [-0.47, -1.22, -0.68], [-1.38, -1.13, -0.96]],
  [[1.34, 1.17, 1.27], [1.19, 0.94, 1.34], [0.88, 1.09, 0.67]],
  [[0.47, 0.5, 0.64], [0.01, 1.03, 0.2], [0.14, 0.2, 0.11]],
  [[-0.8, -0.92, -0.84], [-0.56, -1.2, -1.28], [-1.46, -1.07, -1.45]],
  [[0.02, -0.11, -0.21], [-0.2, 0.22, 0.06], [-0.29, -0.67, -0.49]],
  [[0.59, 0.75, 0.66], [0.47, 0.55, 0.83], [0.02, 0.01, 0.21]],
  [[-0.31, -0.2, -0.17], [-0.63, 0.08, -0.34], [-0.46, -0.56, -0.49]],
  [[2.26, 1.99, 2.01], [1.8, 2.12, 2.19], [1.77, 1.45, 1.87]],
  [[-1.36, -1.25, -1.31], [-1.68, -1.62, -1.5], [-1.49, -1.77, -2.16]],
]);

// C. Houf & Berman (1988), thermal impedance (°C/W × 100), 10 × 3 × 3; data [seen] in the SAS/STAT User's Guide, PROC VARCOMP "Using the GRR Method".
const HOUF = grid([
  [[37, 38, 37], [41, 41, 40], [41, 42, 41]],
  [[42, 41, 43], [42, 42, 42], [43, 42, 43]],
  [[30, 31, 31], [31, 31, 31], [29, 30, 28]],
  [[42, 43, 42], [43, 43, 43], [42, 42, 42]],
  [[28, 30, 29], [29, 30, 29], [31, 29, 29]],
  [[42, 42, 43], [45, 45, 45], [44, 46, 45]],
  [[25, 26, 27], [28, 28, 30], [29, 27, 27]],
  [[40, 40, 40], [43, 42, 42], [43, 43, 41]],
  [[25, 25, 25], [27, 29, 28], [26, 26, 26]],
  [[35, 34, 34], [35, 35, 34], [35, 34, 35]],
]);

// D. Montgomery, 20 parts × 3 operators × 2 measurements; data [seen] in two agreeing university course scripts.
const MONTGOMERY = grid([
  [[21, 20], [20, 20], [19, 21]],
  [[24, 23], [24, 24], [23, 24]],
  [[20, 21], [19, 21], [20, 22]],
  [[27, 27], [28, 26], [27, 28]],
  [[19, 18], [19, 18], [18, 21]],
  [[23, 21], [24, 21], [23, 22]],
  [[22, 21], [22, 24], [22, 20]],
  [[19, 17], [18, 20], [19, 18]],
  [[24, 23], [25, 23], [24, 24]],
  [[25, 23], [26, 25], [24, 25]],
  [[21, 20], [20, 20], [21, 20]],
  [[18, 19], [17, 19], [18, 19]],
  [[23, 25], [25, 25], [25, 25]],
  [[24, 24], [23, 25], [24, 25]],
  [[29, 30], [30, 28], [31, 30]],
  [[26, 26], [25, 26], [25, 27]],
  [[20, 20], [19, 20], [20, 20]],
  [[19, 21], [19, 19], [21, 23]],
  [[25, 26], [25, 24], [25, 25]],
  [[19, 19], [18, 17], [19, 17]],
]);

// Invented for this test (no published example has 0.05 < p < 0.25): six piston pins, three appraisers, two
// trials, inch. Its interaction p-value is checked below against an independent least-squares fit (mathjs) and
// the F distribution of @stdlib, both general-purpose libraries.
const INVENTED = grid([
  [[0.87412, 0.87409], [0.87415, 0.87413], [0.87406, 0.87408]],
  [[0.8746, 0.87462], [0.87463, 0.87466], [0.87457, 0.87455]],
  [[0.87431, 0.87429], [0.87434, 0.87432], [0.87429, 0.8743]],
  [[0.87489, 0.87491], [0.87496, 0.87495], [0.87487, 0.87485]],
  [[0.87441, 0.87442], [0.87444, 0.87445], [0.87439, 0.87437]],
  [[0.8747, 0.87469], [0.87475, 0.87476], [0.87465, 0.87467]],
]);

const comp = (r: { components: { key: string }[] }, key: string) => r.components.find((c) => c.key === key)! as ReturnType<typeof anovaGrr>["components"][number];
const row = (t: { source: string }[], source: string) => t.find((x) => x.source === source)! as ReturnType<typeof anovaGrr>["table"][number];

describe("F-distribution tail from jstat agrees with @stdlib (general-purpose reference library)", () => {
  it.each([
    [0.434, 18, 60],
    [5.273, 18, 60],
    [7.285, 2, 18],
    [1.5, 10, 18],
    [213.52, 9, 60],
  ])("P(F(%d…) > f) for f = %s, df %s/%s", (f, d1, d2) => {
    const ours = fUpperTail(f, d1, d2);
    const reference = 1 - stdlibFCdf(f, d1, d2);
    // Relative agreement: small tails keep their digits in both.
    expect(Math.abs(ours - reference)).toBeLessThan(1e-10 + 1e-8 * reference);
  });
});

describe("A. AIAG MSA 4th ed. GRR example, ANOVA method (interaction pooled into equipment variation)", () => {
  const r = anovaGrr(AIAG, { alpha: 0.25, tolerance: null });

  it("sums of squares 3.16726 / 88.36193 / 0.35898 / 2.75893, total 94.64711 [derived] (3.1673 / 88.3619 / 0.3590 / 2.7589 / 94.6471 [memory])", () => {
    const ss = sumsOfSquares(AIAG).ss;
    expect(ss.appraiser).toBeCloseTo(3.16726, 5);
    expect(ss.part).toBeCloseTo(88.36193, 5);
    expect(ss.interaction).toBeCloseTo(0.35898, 5);
    expect(ss.error).toBeCloseTo(2.75893, 5);
    expect(ss.total).toBeCloseTo(94.64711, 5);
    expect(row(r.fullTable, "interaction").df).toBe(18);
    expect(row(r.fullTable, "repeatability").df).toBe(60);
  });

  it("mean squares 1.58363 / 9.81799 / 0.01994 / 0.04598, and the manual's F column (÷ MS equipment) 34.44 and 213.52 [memory, derived]", () => {
    expect(row(r.fullTable, "appraiser").ms).toBeCloseTo(1.58363, 5);
    expect(row(r.fullTable, "part").ms).toBeCloseTo(9.81799, 5);
    expect(row(r.fullTable, "interaction").ms).toBeCloseTo(0.01994, 5);
    expect(row(r.fullTable, "repeatability").ms).toBeCloseTo(0.04598, 5);
    const msE = row(r.fullTable, "repeatability").ms!;
    expect(row(r.fullTable, "appraiser").ms! / msE).toBeCloseTo(34.44, 2);
    expect(row(r.fullTable, "part").ms! / msE).toBeCloseTo(213.52, 2);
  });

  it("interaction F = 0.434 [seen], p = 0.9741 [seen, derived]: above α = 0.25, so it is pooled", () => {
    expect(row(r.fullTable, "interaction").f).toBeCloseTo(0.434, 3);
    expect(r.pInteraction).toBeCloseTo(0.9741, 4);
    expect(r.pooled).toBe(true);
    expect(row(r.table, "repeatability").df).toBe(78);
    expect(r.table.some((x) => x.source === "interaction")).toBe(false);
  });

  it("EV σ 0.199933, AV σ 0.226838, PV σ 1.042327 [seen, as quoted by a third-party test] [derived]; interaction 0 (pooled) [memory] [derived]", () => {
    expect(comp(r, "repeatability").variance).toBeCloseTo(0.039973, 6);
    expect(comp(r, "repeatability").sd).toBeCloseTo(0.199933, 6);
    expect(comp(r, "appraiser").variance).toBeCloseTo(0.051455, 6);
    expect(comp(r, "appraiser").sd).toBeCloseTo(0.226838, 6);
    expect(comp(r, "interaction").variance).toBe(0);
    expect(comp(r, "part").variance).toBeCloseTo(1.086447, 6);
    expect(comp(r, "part").sd).toBeCloseTo(1.042327, 6);
  });

  it("GRR σ 0.302373 [seen] forum + [seen, as quoted by a third-party test]; TV σ 1.0853 [seen, as quoted by a third-party test] [derived]", () => {
    expect(comp(r, "grr").variance).toBeCloseTo(0.091429, 6);
    expect(comp(r, "grr").sd).toBeCloseTo(0.302373, 5);
    expect(comp(r, "total").variance).toBeCloseTo(1.177875, 6);
    expect(comp(r, "total").sd).toBeCloseTo(1.0853, 4);
  });

  it("GRR is 27.9 % of total variation [seen]; %TV 18.4 / 20.9 / 96.0 and %contribution 3.4 / 4.4 / 7.8 / 92.2 [seen, as quoted by a third-party test] [derived]", () => {
    expect(comp(r, "grr").percentTotalVariation).toBeCloseTo(27.9, 1);
    expect(comp(r, "repeatability").percentTotalVariation).toBeCloseTo(18.4, 1);
    expect(comp(r, "appraiser").percentTotalVariation).toBeCloseTo(20.9, 1);
    expect(comp(r, "part").percentTotalVariation).toBeCloseTo(96.0, 1);
    expect(comp(r, "repeatability").percentContribution).toBeCloseTo(3.4, 1);
    expect(comp(r, "appraiser").percentContribution).toBeCloseTo(4.4, 1);
    expect(comp(r, "grr").percentContribution).toBeCloseTo(7.8, 1);
    expect(comp(r, "part").percentContribution).toBeCloseTo(92.2, 1);
  });

  it("ndc = 1.41 · 1.042327 / 0.302373 = 4.861, printed 4 (p. 129) [seen] forum, [derived]", () => {
    expect((1.41 * comp(r, "part").sd) / comp(r, "grr").sd).toBeCloseTo(4.861, 3);
    expect(r.ndc).toBe(4);
  });
});

describe("A. AIAG MSA 4th ed. GRR example, average-and-range method", () => {
  const r = averageRangeGrr(AIAG, { tolerance: null });

  it("R̄ A/B/C 0.184 / 0.513 / 0.328, R̿ 0.341667 [derived] (0.3417 published [memory])", () => {
    expect(r.rangeByAppraiser.map((x) => Number(x.toFixed(3)))).toEqual([0.184, 0.513, 0.328]);
    expect(r.rBarBar).toBeCloseTo(0.341667, 6);
  });

  it("X̄ A/B/C 0.190333 / 0.068333 / −0.254333, X̄diff 0.444667, Rp 3.511111 [derived] (0.1903 / 0.0683 / −0.2543; 0.4446; 3.511 [memory])", () => {
    expect(r.averageByAppraiser[0]).toBeCloseTo(0.190333, 6);
    expect(r.averageByAppraiser[1]).toBeCloseTo(0.068333, 6);
    expect(r.averageByAppraiser[2]).toBeCloseTo(-0.254333, 6);
    expect(r.xBarDiff).toBeCloseTo(0.444667, 6);
    expect(r.partRange).toBeCloseTo(3.511111, 6);
  });

  it("EV 0.201857, AV 0.229667, GRR 0.305766, PV 1.104596, TV 1.146135 at full precision [derived]", () => {
    expect(r.ev).toBeCloseTo(0.201857, 6);
    expect(r.av).toBeCloseTo(0.229667, 6);
    expect(r.grr).toBeCloseTo(0.305766, 6);
    expect(r.pv).toBeCloseTo(1.104596, 6);
    expect(r.tv).toBeCloseTo(1.146135, 6);
  });

  it("%EV 17.61, %AV 20.04, %GRR 26.68, %PV 96.38 of TV; ndc 5.094 → 5 [derived] (17.6 / 20.0 / 26.7 / 96.4; ndc 5 published [memory])", () => {
    expect(comp(r, "repeatability").percentTotalVariation).toBeCloseTo(17.61, 2);
    expect(comp(r, "reproducibility").percentTotalVariation).toBeCloseTo(20.04, 2);
    expect(comp(r, "grr").percentTotalVariation).toBeCloseTo(26.68, 2);
    expect(comp(r, "part").percentTotalVariation).toBeCloseTo(96.38, 2);
    expect(r.ndc).toBe(5);
  });

  it("from the published rounded intermediates R̿ 0.3417, X̄diff 0.4446, Rp 3.511: EV 0.20188, AV 0.22963, GRR 0.30575, PV 1.10456, TV 1.14610 [memory]", () => {
    const p = averageRangeFromSummary({ rBarBar: 0.3417, xBarDiff: 0.4446, partRange: 3.511, parts: 10, appraisers: 3, trials: 3 }, null);
    expect(p.ev).toBeCloseTo(0.20188, 5);
    expect(p.av).toBeCloseTo(0.22963, 5);
    expect(p.grr).toBeCloseTo(0.30575, 5);
    expect(p.pv).toBeCloseTo(1.10456, 5);
    expect(p.tv).toBeCloseTo(1.1461, 4);
  });
});

describe("average-and-range constants (AIAG MSA 4th ed. [memory], each reproduced as 1/d2 or 1/d2* [derived])", () => {
  it("K1 = 1/d2 with d2 = 2/√π for 2 trials and 3/√π for 3 (expected range of 2 and 3 normal values)", () => {
    expect(K1[2]).toBeCloseTo(Math.sqrt(Math.PI) / 2, 4);
    expect(K1[3]).toBeCloseTo(Math.sqrt(Math.PI) / 3, 4);
  });

  it("K2 and K3 = 1/d2* for one subgroup, d2* = √(d2² + d3²) (d2, d3 from control-chart tables, from memory)", () => {
    const d2 = { 2: 1.128, 3: 1.693, 4: 2.059, 5: 2.326, 6: 2.534, 7: 2.704, 8: 2.847, 9: 2.97, 10: 3.078 } as Record<number, number>;
    const d3 = { 2: 0.853, 3: 0.888, 4: 0.88, 5: 0.864, 6: 0.848, 7: 0.833, 8: 0.82, 9: 0.808, 10: 0.797 } as Record<number, number>;
    for (const m of [2, 3]) expect(K2[m]).toBeCloseTo(1 / Math.hypot(d2[m], d3[m]), 3);
    for (let m = 2; m <= 10; m++) expect(K3[m]).toBeCloseTo(1 / Math.hypot(d2[m], d3[m]), 3);
  });

  it("chart factors A2 = 3/(d2·√n) and D4 = 1 + 3·d3/d2 give 1.880 / 1.023 and 3.267 / 2.574 (control-chart tables, from memory)", () => {
    expect(3 / (D2[2] * Math.sqrt(2))).toBeCloseTo(1.88, 2);
    expect(3 / (D2[3] * Math.sqrt(3))).toBeCloseTo(1.023, 3);
    expect(1 + (3 * D3_FACTOR[2]) / D2[2]).toBeCloseTo(3.267, 2);
    expect(1 + (3 * D3_FACTOR[3]) / D2[3]).toBeCloseTo(2.574, 2);
  });
});

describe("C. Houf & Berman (1988) thermal impedance: significant interaction, never pooled", () => {
  it("sums of squares 3935.955556 / 39.266667 / 48.511111 [seen] (SAS GRR Analysis of Variance); error 30.666667, total 4054.4 [derived]", () => {
    const ss = sumsOfSquares(HOUF).ss;
    expect(ss.part).toBeCloseTo(3935.955556, 5);
    expect(ss.appraiser).toBeCloseTo(39.266667, 5);
    expect(ss.interaction).toBeCloseTo(48.511111, 5);
    expect(ss.error).toBeCloseTo(30.666667, 5);
    expect(ss.total).toBeCloseTo(4054.4, 5);
  });

  it("F interaction 5.273 (p = 5.1e-7), operators 7.285 ÷ MS interaction (p = 0.0048), parts 162.27 [derived]: kept at α 0.25 and at α 0.05", () => {
    for (const alpha of [0.25, 0.05]) {
      const r = anovaGrr(HOUF, { alpha, tolerance: 40 });
      expect(r.pooled).toBe(false);
      expect(row(r.table, "interaction").f).toBeCloseTo(5.273, 3);
      expect(r.pInteraction).toBeCloseTo(5.1e-7, 8);
      expect(row(r.table, "appraiser").f).toBeCloseTo(7.285, 3);
      expect(row(r.table, "appraiser").p).toBeCloseTo(0.0048, 4);
      expect(row(r.table, "part").f).toBeCloseTo(162.27, 2);
    }
  });

  it("variance components 0.511111 / 0.564609 / 0.727984, GRR 1.803704, part 48.292593 [derived] (0.51 / 0.56 / 0.73 / 1.80 / 48.29 Montgomery [memory])", () => {
    const r = anovaGrr(HOUF, { alpha: 0.25, tolerance: 58 - 18 });
    expect(comp(r, "repeatability").variance).toBeCloseTo(0.511111, 6);
    expect(comp(r, "appraiser").variance).toBeCloseTo(0.564609, 6);
    expect(comp(r, "interaction").variance).toBeCloseTo(0.727984, 6);
    expect(comp(r, "reproducibility").variance).toBeCloseTo(0.564609 + 0.727984, 6);
    expect(comp(r, "grr").variance).toBeCloseTo(1.803704, 6);
    expect(comp(r, "part").variance).toBeCloseTo(48.292593, 6);
    expect(comp(r, "total").variance).toBeCloseTo(50.096296, 6);
    expect(comp(r, "grr").sd).toBeCloseTo(1.34302, 5);
  });

  it("%TV 10.10 / 10.62 / 12.05 / 18.97 / 98.18 and %contribution 1.02 / 1.13 / 1.45 / 3.60 / 96.40 [derived]; ndc 7.296 → 7 [derived]", () => {
    const r = anovaGrr(HOUF, { alpha: 0.25, tolerance: 40 });
    const tv = ["repeatability", "appraiser", "interaction", "grr", "part"].map((k) => comp(r, k).percentTotalVariation!);
    expect(tv.map((x) => Number(x.toFixed(2)))).toEqual([10.1, 10.62, 12.05, 18.97, 98.18]);
    const pc = ["repeatability", "appraiser", "interaction", "grr", "part"].map((k) => comp(r, k).percentContribution!);
    expect(pc.map((x) => Number(x.toFixed(2)))).toEqual([1.02, 1.13, 1.45, 3.6, 96.4]);
    expect(r.ndc).toBe(7);
  });

  it("P/T = 6 · σ_GRR / (58 − 18) = 0.2015 [derived] (≈ 0.20 Montgomery [memory]): 20.15 % of tolerance, a conditional gauge", () => {
    const r = anovaGrr(HOUF, { alpha: 0.25, tolerance: 58 - 18 });
    expect(comp(r, "grr").percentTolerance).toBeCloseTo(20.15, 2);
    expect(r.verdict.verdict).toBe("conditional");
    expect(r.verdict.basis).toBe("tolerance");
  });
});

describe("D. Montgomery, 20 parts × 3 operators × 2 measurements", () => {
  it("sums of squares 1185.425 / 2.617 / 27.050 / 59.500, total 1274.592; p interaction 0.8614 [memory], reproduced [derived]", () => {
    const ss = sumsOfSquares(MONTGOMERY).ss;
    expect(ss.part).toBeCloseTo(1185.425, 3);
    expect(ss.appraiser).toBeCloseTo(2.617, 3);
    expect(ss.interaction).toBeCloseTo(27.05, 3);
    expect(ss.error).toBeCloseTo(59.5, 3);
    expect(ss.total).toBeCloseTo(1274.592, 3);
    expect(anovaGrr(MONTGOMERY, { alpha: 0.25, tolerance: null }).pInteraction).toBeCloseTo(0.8614, 4);
  });

  it("reduced model: pooled MS 0.883163 on 98 df, σ²_O 0.010629, σ²_P 10.251271, σ_GRR 0.945406, 28.32 % of TV, ndc 4.775 → 4 [derived] (MS_E 0.88, σ²_O ≈ 0.0108, σ²_P ≈ 10.25 [memory])", () => {
    const r = anovaGrr(MONTGOMERY, { alpha: 0.25, tolerance: null });
    expect(r.pooled).toBe(true);
    expect(row(r.table, "repeatability").df).toBe(98);
    expect(row(r.table, "repeatability").ms).toBeCloseTo(0.883163, 6);
    expect(comp(r, "appraiser").variance).toBeCloseTo(0.010629, 6);
    expect(comp(r, "part").variance).toBeCloseTo(10.251271, 6);
    expect(comp(r, "grr").sd).toBeCloseTo(0.945406, 6);
    expect(comp(r, "grr").percentTotalVariation).toBeCloseTo(28.32, 2);
    expect(r.ndc).toBe(4);
  });

  it("full model (interaction kept): σ²_P 10.28, σ²_O 0.015, σ²_PO −0.14 set to 0, σ² 0.99 [memory], reproduced [derived]", () => {
    // α above the interaction's p-value keeps the interaction in the model.
    const r = anovaGrr(MONTGOMERY, { alpha: 0.9, tolerance: null });
    expect(r.pooled).toBe(false);
    expect(comp(r, "part").variance).toBeCloseTo(10.28, 2);
    expect(comp(r, "appraiser").variance).toBeCloseTo(0.015, 3);
    expect(comp(r, "interaction").variance).toBe(0);
    expect(r.negativeSetToZero).toEqual(["interaction"]);
    expect(comp(r, "repeatability").variance).toBeCloseTo(0.99, 2);
  });

  it("range method: R̄ 1.00 / 1.25 / 1.20 [derived], R̿ 1.15, σ_repeatability 1.15/1.128 ≈ 1.02 [memory]", () => {
    // Twenty parts lie beyond the K3 table (a study here takes at most ten), so the ranges are read off the range chart.
    const c = studyCharts(MONTGOMERY);
    const byAppraiser = [0, 1, 2].map((j) => c.range.points.filter((p) => p.appraiser === j).reduce((s, p) => s + p.value, 0) / 20);
    expect(byAppraiser.map((x) => Number(x.toFixed(2)))).toEqual([1, 1.25, 1.2]);
    expect(c.range.center).toBeCloseTo(1.15, 2);
    expect(c.range.center * K1[2]).toBeCloseTo(1.02, 2);
  });
});

describe("the pooling threshold α, on an invented case with 0.05 < p(interaction) < 0.25", () => {
  /** Interaction F and p from a least-squares fit of dummy-coded models (mathjs) and @stdlib's F distribution. */
  function independentInteractionP(y: StudyGrid) {
    const math = create(all, {});
    const p = y.length;
    const o = y[0].length;
    // Whole numbers of 0.00001 in, so the normal equations are well conditioned.
    const obs: { i: number; j: number; v: number }[] = [];
    y.forEach((row, i) => row.forEach((cell, j) => cell.forEach((v) => obs.push({ i, j, v: Math.round(v * 1e5) - 87400 }))));
    const rss = (cols: (o: { i: number; j: number }) => number[]) => {
      const X = obs.map(cols);
      const Y = obs.map((x) => [x.v]);
      const Xt = math.transpose(X);
      const beta = math.lusolve(math.multiply(Xt, X), math.multiply(Xt, Y)) as number[][];
      const fit = math.multiply(X, beta) as number[][];
      return obs.reduce((s, x, k) => s + (x.v - fit[k][0]) ** 2, 0);
    };
    const dummies = (n: number, k: number) => Array.from({ length: n - 1 }, (_, m) => (k === m + 1 ? 1 : 0));
    const additive = rss((x) => [1, ...dummies(p, x.i), ...dummies(o, x.j)]);
    const cells = rss((x) => Array.from({ length: p * o }, (_, c) => (c === x.i * o + x.j ? 1 : 0)));
    const dfInt = (p - 1) * (o - 1);
    const dfErr = obs.length - p * o;
    const f = (additive - cells) / dfInt / (cells / dfErr);
    return { f, p: 1 - stdlibFCdf(f, dfInt, dfErr) };
  }

  it("the interaction's p-value lies between 0.05 and 0.25 (invented data; cross-checked with mathjs least squares and @stdlib's F distribution)", () => {
    const ours = anovaGrr(INVENTED, { alpha: 0.25, tolerance: 0.0005 });
    const ref = independentInteractionP(INVENTED);
    expect(row(ours.fullTable, "interaction").f).toBeCloseTo(ref.f, 8);
    expect(ours.pInteraction).toBeCloseTo(ref.p, 10);
    expect(ours.pInteraction).toBeGreaterThan(0.05);
    expect(ours.pInteraction).toBeLessThan(0.25);
  });

  it("with the default α = 0.25 the interaction is kept (p below α) and has its own component", () => {
    const r = anovaGrr(INVENTED, { alpha: 0.25, tolerance: 0.0005 });
    expect(r.pooled).toBe(false);
    expect(r.table.map((x) => x.source)).toContain("interaction");
    expect(comp(r, "interaction").variance).toBeGreaterThan(0);
  });

  it("with a shop α of 0.05 the same data pool the interaction into repeatability (p above α)", () => {
    const kept = anovaGrr(INVENTED, { alpha: 0.25, tolerance: 0.0005 });
    const pooled = anovaGrr(INVENTED, { alpha: 0.05, tolerance: 0.0005 });
    expect(pooled.pooled).toBe(true);
    expect(comp(pooled, "interaction").variance).toBe(0);
    expect(row(pooled.table, "repeatability").df).toBe(row(kept.fullTable, "interaction").df + row(kept.fullTable, "repeatability").df);
    // The pooled mean square is the df-weighted mean of the two it replaces.
    const a = row(kept.fullTable, "interaction");
    const e = row(kept.fullTable, "repeatability");
    expect(row(pooled.table, "repeatability").ms).toBeCloseTo((a.ss + e.ss) / (a.df + e.df), 15);
  });
});

describe("number of distinct categories and the verdict band (AIAG MSA 4th ed. thresholds)", () => {
  it("ndc is 1.41 · σ_part / σ_GRR truncated and at least 1 [seen in open-source statistics packages]", () => {
    expect(distinctCategories(1, 0.3)).toBe(4);
    expect(distinctCategories(0.01, 1)).toBe(1);
    expect(distinctCategories(1, 0)).toBeNull();
  });

  const withGrr = (percentTolerance: number) => [
    { key: "grr" as const, variance: 1, sd: 1, percentTotalVariation: 5, percentContribution: 1, percentTolerance },
  ];
  it("below 10 % of tolerance is acceptable, 10 % through 30 % conditional, above 30 % not acceptable [memory]", () => {
    expect(verdictFor(withGrr(9.9), 12).verdict).toBe("acceptable");
    expect(verdictFor(withGrr(10), 12).verdict).toBe("conditional");
    expect(verdictFor(withGrr(30), 12).verdict).toBe("conditional");
    expect(verdictFor(withGrr(30.1), 12).verdict).toBe("not_acceptable");
  });

  it("fewer than five distinct categories holds an otherwise acceptable gauge at conditional (ndc ≥ 5 [seen in open-source statistics packages])", () => {
    const v = verdictFor(withGrr(8), 4);
    expect(v.verdict).toBe("conditional");
    expect(v.reasons.join(" ")).toMatch(/4 distinct categories/);
  });
});

describe("range and average charts by appraiser", () => {
  const c = studyCharts(AIAG);
  it("the range chart's centre is R̿ = 0.341667 and its upper limit D4·R̿ = 2.574 × 0.341667 (control-chart factor from memory) [derived]", () => {
    expect(c.range.center).toBeCloseTo(0.341667, 6);
    expect(c.range.ucl).toBeCloseTo(2.574 * 0.341667, 2);
    expect(c.range.lcl).toBe(0);
  });

  it("appraiser B's part 4 range 1.02 falls above the upper range limit 0.879; part 2's 0.75 stays inside [derived]", () => {
    const beyond = c.range.beyondLimits.map((p) => `${"ABC"[p.appraiser]}${p.part + 1}:${p.value.toFixed(2)}`);
    expect(beyond).toEqual(["B4:1.02"]);
    expect(c.range.points.find((p) => p.appraiser === 1 && p.part === 1)!.value).toBeCloseTo(0.75, 10);
    expect(c.range.ucl).toBeCloseTo(0.879, 3);
  });

  it("most part averages lie outside X̿ ± A2·R̿: the gauge sees the parts' spread [derived]", () => {
    expect(c.average.center).toBeCloseTo(0.001444, 6);
    expect(c.average.percentBeyond).toBeGreaterThan(50);
    expect(c.interaction).toHaveLength(10);
    expect(c.interaction[0].byAppraiser[0]).toBeCloseTo((0.29 + 0.41 + 0.64) / 3, 10);
  });
});
