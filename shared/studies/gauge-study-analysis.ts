import jStat from "jstat";
import type { ComponentKey, Verdict } from "./study-labels";

export { COMPONENT_LABELS, VERDICT_LABELS, type ComponentKey, type Verdict } from "./study-labels";

// Gauge repeatability and reproducibility, crossed design: every appraiser measures every part the same number
// of times. Statistics are estimates, so plain floating point is right here (lengths judged against a limit use
// exact decimals elsewhere). Formulas: AIAG MSA reference manual, 4th ed. (2010), ANOVA and average-and-range
// methods; Montgomery, Introduction to Statistical Quality Control, §8.7 (two-way random-effects model).

/** Values as [part][appraiser][trial], in one unit. */
export type StudyGrid = number[][][];

export interface VarianceComponent {
  key: ComponentKey;
  variance: number;
  /** Standard deviation σ = √variance (the "study variation" of the 4th edition is 6σ). */
  sd: number;
  /** 100 · σ / σ_total; null when the total is zero. */
  percentTotalVariation: number | null;
  /** 100 · σ² / σ²_total; null when the total is zero. */
  percentContribution: number | null;
  /** 100 · 6σ / (USL − LSL); null without a tolerance. */
  percentTolerance: number | null;
}

export interface AnovaRow {
  source: "part" | "appraiser" | "interaction" | "repeatability" | "total";
  df: number;
  ss: number;
  ms: number | null;
  f: number | null;
  p: number | null;
}

export interface VerdictResult {
  verdict: Verdict;
  /** What the band was judged on: the GRR as % of tolerance (accept/reject use), or of total variation without a tolerance. */
  basis: "tolerance" | "total_variation";
  percentGrr: number | null;
  reasons: string[];
}

export interface MethodResult {
  components: VarianceComponent[];
  /** Number of distinct categories, 1.41 · σ_part / σ_GRR truncated, at least 1; null when σ_GRR is zero. */
  ndc: number | null;
  verdict: VerdictResult;
}

export interface AnovaResult extends MethodResult {
  method: "anova";
  /** The table as fitted: with the interaction row, or with it pooled into repeatability. */
  table: AnovaRow[];
  /** The full-model table, with the interaction tested against repeatability. */
  fullTable: AnovaRow[];
  pInteraction: number;
  alpha: number;
  pooled: boolean;
  /** Components that came out negative and were set to zero. */
  negativeSetToZero: ComponentKey[];
}

export interface AverageRangeResult extends MethodResult {
  method: "average_range";
  rangeByAppraiser: number[];
  rBarBar: number;
  averageByAppraiser: number[];
  xBarDiff: number;
  partRange: number;
  constants: { K1: number; K2: number; K3: number };
  /** The standard deviations as the 4th edition names them. */
  ev: number;
  av: number;
  grr: number;
  pv: number;
  tv: number;
}

const sum = (xs: number[]) => xs.reduce((a, b) => a + b, 0);
const mean = (xs: number[]) => sum(xs) / xs.length;

/** Checks a grid is complete and rectangular; returns its sizes. */
export function gridShape(y: StudyGrid): { parts: number; appraisers: number; trials: number } {
  const parts = y.length;
  const appraisers = y[0]?.length ?? 0;
  const trials = y[0]?.[0]?.length ?? 0;
  if (parts < 2 || appraisers < 2 || trials < 2) throw new RangeError("A crossed study needs at least 2 parts, 2 appraisers and 2 trials.");
  for (const row of y) {
    if (row.length !== appraisers) throw new RangeError("Every part needs a value from every appraiser.");
    for (const cell of row) {
      if (cell.length !== trials) throw new RangeError("Every appraiser needs the same number of trials on every part.");
      for (const v of cell) if (!Number.isFinite(v)) throw new RangeError("Every value must be a finite number.");
    }
  }
  return { parts, appraisers, trials };
}

/**
 * Upper-tail probability of the F distribution, P(F(df1, df2) > f), from jstat's regularized incomplete beta
 * (the complement is taken inside the beta function, so small p-values keep their digits).
 */
export function fUpperTail(f: number, df1: number, df2: number): number {
  if (!(f > 0)) return 1;
  if (!Number.isFinite(f)) return 0;
  return jStat.ibeta(df2 / (df2 + df1 * f), df2 / 2, df1 / 2);
}

/** The two-way crossed sums of squares (Montgomery §8.7.2; AIAG MSA 4th ed., ANOVA method). */
export function sumsOfSquares(y: StudyGrid) {
  const { parts: p, appraisers: o, trials: r } = gridShape(y);
  const all = y.flat(2);
  const grand = mean(all);
  const partMeans = y.map((row) => mean(row.flat()));
  const appraiserMeans = Array.from({ length: o }, (_, j) => mean(y.map((row) => row[j]).flat()));
  const cellMeans = y.map((row) => row.map((cell) => mean(cell)));
  const ssPart = o * r * sum(partMeans.map((m) => (m - grand) ** 2));
  const ssAppraiser = p * r * sum(appraiserMeans.map((m) => (m - grand) ** 2));
  const ssInteraction = r * sum(cellMeans.flatMap((row, i) => row.map((m, j) => (m - partMeans[i] - appraiserMeans[j] + grand) ** 2)));
  const ssError = sum(y.flatMap((row, i) => row.flatMap((cell, j) => cell.map((v) => (v - cellMeans[i][j]) ** 2))));
  const ssTotal = sum(all.map((v) => (v - grand) ** 2));
  return {
    p,
    o,
    r,
    grand,
    partMeans,
    appraiserMeans,
    cellMeans,
    ss: { part: ssPart, appraiser: ssAppraiser, interaction: ssInteraction, error: ssError, total: ssTotal },
    df: { part: p - 1, appraiser: o - 1, interaction: (p - 1) * (o - 1), error: p * o * (r - 1), total: p * o * r - 1 },
  };
}

/** The components table from variances; percentages against the total, and of the tolerance when one is given. */
function componentsFrom(variances: Partial<Record<ComponentKey, number>>, tolerance: number | null): VarianceComponent[] {
  const total = variances.total!;
  const sdTotal = Math.sqrt(total);
  const order: ComponentKey[] = ["repeatability", "reproducibility", "appraiser", "interaction", "grr", "part", "total"];
  return order
    .filter((k) => variances[k] !== undefined)
    .map((key) => {
      const variance = variances[key]!;
      const sd = Math.sqrt(variance);
      return {
        key,
        variance,
        sd,
        percentTotalVariation: total > 0 ? (100 * sd) / sdTotal : null,
        percentContribution: total > 0 ? (100 * variance) / total : null,
        percentTolerance: tolerance && tolerance > 0 ? (100 * 6 * sd) / tolerance : null,
      };
    });
}

/** ndc = 1.41 · σ_part / σ_GRR, truncated, at least 1 (AIAG MSA 4th ed.); null when the gauge showed no variation at all. */
export function distinctCategories(sdPart: number, sdGrr: number): number | null {
  if (!(sdGrr > 0)) return null;
  // A hair of tolerance so that an exact 5.0 computed as 4.9999999999 is not truncated to 4.
  return Math.max(1, Math.floor((1.41 * sdPart) / sdGrr + 1e-9));
}

/** Thresholds of the verdict bands (AIAG MSA 4th ed.): below 10 % acceptable, 10–30 % conditional, above 30 % not. */
export const GRR_ACCEPTABLE_BELOW = 10;
export const GRR_NOT_ACCEPTABLE_ABOVE = 30;
/** The least number of distinct categories for an acceptable system (AIAG MSA 4th ed.). */
export const MIN_NDC = 5;

/**
 * The verdict band. An overhaul shop uses these tools to accept or reject parts against limits, so the GRR is
 * judged as a percentage of the tolerance (AIAG's guidance for product control), or of total variation where no
 * tolerance is known. Fewer than five distinct categories holds the verdict at conditional at best.
 */
export function verdictFor(components: VarianceComponent[], ndc: number | null): VerdictResult {
  const grr = components.find((c) => c.key === "grr")!;
  const basis = grr.percentTolerance != null ? "tolerance" : "total_variation";
  const percentGrr = basis === "tolerance" ? grr.percentTolerance : grr.percentTotalVariation;
  const reasons: string[] = [];
  let verdict: Verdict;
  const of = basis === "tolerance" ? "of the tolerance" : "of the total variation";
  if (percentGrr == null) {
    verdict = "not_acceptable";
    reasons.push("The study shows no variation at all; the readings cannot tell the parts apart.");
  } else if (percentGrr < GRR_ACCEPTABLE_BELOW) {
    verdict = "acceptable";
    reasons.push(`GRR is ${percentGrr.toFixed(1)} % ${of}, below ${GRR_ACCEPTABLE_BELOW} %.`);
  } else if (percentGrr <= GRR_NOT_ACCEPTABLE_ABOVE) {
    verdict = "conditional";
    reasons.push(`GRR is ${percentGrr.toFixed(1)} % ${of}, between ${GRR_ACCEPTABLE_BELOW} % and ${GRR_NOT_ACCEPTABLE_ABOVE} %.`);
  } else {
    verdict = "not_acceptable";
    reasons.push(`GRR is ${percentGrr.toFixed(1)} % ${of}, above ${GRR_NOT_ACCEPTABLE_ABOVE} %.`);
  }
  if (ndc != null && ndc < MIN_NDC) {
    reasons.push(`Only ${ndc} distinct categor${ndc === 1 ? "y" : "ies"} (at least ${MIN_NDC} wanted): the parts chosen may span too little, or the readings are too coarse to sort them.`);
    if (verdict === "acceptable") verdict = "conditional";
  }
  if (ndc == null && percentGrr != null) reasons.push("Every reading of a part agreed exactly: check that the tool's resolution is fine enough to show variation.");
  return { verdict, basis, percentGrr, reasons };
}

/**
 * Two-way random-effects ANOVA with interaction (parts × appraisers). The interaction is pooled into
 * repeatability when its p-value exceeds α (Bancroft & Han, JASA 1983: 0.25 in several statistics packages);
 * negative variance components are set to zero.
 */
export function anovaGrr(y: StudyGrid, opts: { alpha: number; tolerance: number | null }): AnovaResult {
  const s = sumsOfSquares(y);
  const { p, o, r, ss, df } = s;
  const ms = { part: ss.part / df.part, appraiser: ss.appraiser / df.appraiser, interaction: ss.interaction / df.interaction, error: ss.error / df.error };

  // Full model: parts and appraisers tested against the interaction, the interaction against repeatability.
  const fInteraction = ms.error > 0 ? ms.interaction / ms.error : ms.interaction > 0 ? Infinity : 0;
  const pInteraction = ms.error > 0 ? fUpperTail(fInteraction, df.interaction, df.error) : ms.interaction > 0 ? 0 : 1;
  const fTest = (num: number, den: number, d1: number, d2: number) => {
    const f = den > 0 ? num / den : num > 0 ? Infinity : 0;
    return { f, p: den > 0 ? fUpperTail(f, d1, d2) : num > 0 ? 0 : 1 };
  };
  const fullPart = fTest(ms.part, ms.interaction, df.part, df.interaction);
  const fullAppr = fTest(ms.appraiser, ms.interaction, df.appraiser, df.interaction);
  const fullTable: AnovaRow[] = [
    { source: "part", df: df.part, ss: ss.part, ms: ms.part, ...fullPart },
    { source: "appraiser", df: df.appraiser, ss: ss.appraiser, ms: ms.appraiser, ...fullAppr },
    { source: "interaction", df: df.interaction, ss: ss.interaction, ms: ms.interaction, f: fInteraction, p: pInteraction },
    { source: "repeatability", df: df.error, ss: ss.error, ms: ms.error, f: null, p: null },
    { source: "total", df: df.total, ss: ss.total, ms: null, f: null, p: null },
  ];

  const pooled = pInteraction > opts.alpha;
  const negative: ComponentKey[] = [];
  const clip = (key: ComponentKey, v: number) => {
    if (v < 0) {
      negative.push(key);
      return 0;
    }
    return v;
  };
  let table: AnovaRow[];
  let repeatability: number;
  let appraiser: number;
  let interaction: number;
  let part: number;
  if (pooled) {
    const dfPool = df.interaction + df.error;
    const msPool = (ss.interaction + ss.error) / dfPool;
    const tp = fTest(ms.part, msPool, df.part, dfPool);
    const ta = fTest(ms.appraiser, msPool, df.appraiser, dfPool);
    table = [
      { source: "part", df: df.part, ss: ss.part, ms: ms.part, ...tp },
      { source: "appraiser", df: df.appraiser, ss: ss.appraiser, ms: ms.appraiser, ...ta },
      { source: "repeatability", df: dfPool, ss: ss.interaction + ss.error, ms: msPool, f: null, p: null },
      { source: "total", df: df.total, ss: ss.total, ms: null, f: null, p: null },
    ];
    repeatability = msPool;
    appraiser = clip("appraiser", (ms.appraiser - msPool) / (p * r));
    interaction = 0;
    part = clip("part", (ms.part - msPool) / (o * r));
  } else {
    table = fullTable;
    repeatability = ms.error;
    interaction = clip("interaction", (ms.interaction - ms.error) / r);
    appraiser = clip("appraiser", (ms.appraiser - ms.interaction) / (p * r));
    part = clip("part", (ms.part - ms.interaction) / (o * r));
  }
  const reproducibility = appraiser + interaction;
  const grr = repeatability + reproducibility;
  const components = componentsFrom({ repeatability, reproducibility, appraiser, interaction, grr, part, total: grr + part }, opts.tolerance);
  const ndc = distinctCategories(Math.sqrt(part), Math.sqrt(grr));
  return { method: "anova", table, fullTable, pInteraction, alpha: opts.alpha, pooled, negativeSetToZero: negative, components, ndc, verdict: verdictFor(components, ndc) };
}

// Average-and-range constants (AIAG MSA 4th ed., from memory; each is 1/d2 or 1/d2* — see the tests).
/** K1 by number of trials. */
export const K1: Record<number, number> = { 2: 0.8862, 3: 0.5908 };
/** K2 by number of appraisers. */
export const K2: Record<number, number> = { 2: 0.7071, 3: 0.5231 };
/** K3 by number of parts. */
export const K3: Record<number, number> = { 2: 0.7071, 3: 0.5231, 4: 0.4467, 5: 0.403, 6: 0.3742, 7: 0.3534, 8: 0.3375, 9: 0.3249, 10: 0.3146 };

/** The average-and-range formulas on their summary figures (so published rounded intermediates can be checked too). */
export function averageRangeFromSummary(s: { rBarBar: number; xBarDiff: number; partRange: number; parts: number; appraisers: number; trials: number }, tolerance: number | null) {
  const k1 = K1[s.trials];
  const k2 = K2[s.appraisers];
  const k3 = K3[s.parts];
  if (k1 == null || k2 == null || k3 == null) throw new RangeError("The average-and-range method covers 2–3 trials, 2–3 appraisers and 2–10 parts.");
  const ev = s.rBarBar * k1;
  // AV² = (X̄diff·K2)² − EV²/(n·r); a negative value means no appraiser effect (AIAG sets AV to 0).
  const av2 = (s.xBarDiff * k2) ** 2 - ev ** 2 / (s.parts * s.trials);
  const av = av2 > 0 ? Math.sqrt(av2) : 0;
  const grr = Math.sqrt(ev ** 2 + av ** 2);
  const pv = s.partRange * k3;
  const tv = Math.sqrt(grr ** 2 + pv ** 2);
  const components = componentsFrom({ repeatability: ev ** 2, reproducibility: av ** 2, grr: grr ** 2, part: pv ** 2, total: tv ** 2 }, tolerance);
  const ndc = distinctCategories(pv, grr);
  return { ev, av, grr, pv, tv, constants: { K1: k1, K2: k2, K3: k3 }, components, ndc, verdict: verdictFor(components, ndc) };
}

/** The average-and-range method (AIAG MSA 4th ed.): EV from the average range, AV from the spread of appraiser averages, PV from the range of part averages. */
export function averageRangeGrr(y: StudyGrid, opts: { tolerance: number | null }): AverageRangeResult {
  const { parts, appraisers, trials } = gridShape(y);
  const ranges = y.map((row) => row.map((cell) => Math.max(...cell) - Math.min(...cell)));
  const rangeByAppraiser = Array.from({ length: appraisers }, (_, j) => mean(ranges.map((row) => row[j])));
  const rBarBar = mean(rangeByAppraiser);
  const averageByAppraiser = Array.from({ length: appraisers }, (_, j) => mean(y.map((row) => row[j]).flat()));
  const xBarDiff = Math.max(...averageByAppraiser) - Math.min(...averageByAppraiser);
  const partMeans = y.map((row) => mean(row.flat()));
  const partRange = Math.max(...partMeans) - Math.min(...partMeans);
  const r = averageRangeFromSummary({ rBarBar, xBarDiff, partRange, parts, appraisers, trials }, opts.tolerance);
  return { method: "average_range", rangeByAppraiser, rBarBar, averageByAppraiser, xBarDiff, partRange, ...r };
}

// Control-chart factors for subgroups of n trials (ASTM E2587 tables; Montgomery appendix VI), from memory:
// d2 and d3 give A2 = 3/(d2·√n) and D4 = 1 + 3·d3/d2, D3 = max(0, 1 − 3·d3/d2).
export const D2: Record<number, number> = { 2: 1.128, 3: 1.693 };
export const D3_FACTOR: Record<number, number> = { 2: 0.853, 3: 0.888 };

export interface ChartPoint {
  appraiser: number;
  part: number;
  value: number;
}

export interface StudyCharts {
  range: { points: ChartPoint[]; center: number; ucl: number; lcl: number; beyondLimits: ChartPoint[] };
  average: { points: ChartPoint[]; center: number; ucl: number; lcl: number; beyondLimits: number; percentBeyond: number };
  /** Appraiser averages per part, for the interaction plot (lines that cross or diverge show an appraiser × part effect). */
  interaction: { part: number; byAppraiser: number[] }[];
}

/**
 * Range and average charts by appraiser (AIAG MSA 4th ed.): ranges against D4·R̿ (an appraiser out of control
 * there measures inconsistently); averages against X̿ ± A2·R̿, where about half or more points outside show that
 * the parts' spread stands out above the gauge's variation.
 */
export function studyCharts(y: StudyGrid): StudyCharts {
  const { parts, appraisers, trials } = gridShape(y);
  const d2 = D2[trials];
  const d3 = D3_FACTOR[trials];
  if (d2 == null) throw new RangeError("Control limits are tabulated for 2 or 3 trials.");
  const rangePts: ChartPoint[] = [];
  const avgPts: ChartPoint[] = [];
  for (let j = 0; j < appraisers; j++) {
    for (let i = 0; i < parts; i++) {
      const cell = y[i][j];
      rangePts.push({ appraiser: j, part: i, value: Math.max(...cell) - Math.min(...cell) });
      avgPts.push({ appraiser: j, part: i, value: mean(cell) });
    }
  }
  const rBarBar = mean(rangePts.map((p) => p.value));
  const xBarBar = mean(avgPts.map((p) => p.value));
  const a2 = 3 / (d2 * Math.sqrt(trials));
  const ucl = (1 + (3 * d3) / d2) * rBarBar;
  const lcl = Math.max(0, 1 - (3 * d3) / d2) * rBarBar;
  const aUcl = xBarBar + a2 * rBarBar;
  const aLcl = xBarBar - a2 * rBarBar;
  const beyond = avgPts.filter((p) => p.value > aUcl || p.value < aLcl).length;
  return {
    range: { points: rangePts, center: rBarBar, ucl, lcl, beyondLimits: rangePts.filter((p) => p.value > ucl + 1e-12) },
    average: { points: avgPts, center: xBarBar, ucl: aUcl, lcl: aLcl, beyondLimits: beyond, percentBeyond: (100 * beyond) / avgPts.length },
    interaction: Array.from({ length: parts }, (_, i) => ({ part: i, byAppraiser: Array.from({ length: appraisers }, (_, j) => mean(y[i][j])) })),
  };
}
