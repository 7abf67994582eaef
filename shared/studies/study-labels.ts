// Words for gauge-study results, shared by pages, reports and the analysis (kept apart so a page showing a verdict
// does not load the statistics).

export type Verdict = "acceptable" | "conditional" | "not_acceptable";

export const VERDICT_LABELS: Record<Verdict, string> = {
  acceptable: "Acceptable",
  conditional: "Conditional — may be acceptable for some uses",
  not_acceptable: "Not acceptable",
};

export type ComponentKey = "repeatability" | "reproducibility" | "appraiser" | "interaction" | "grr" | "part" | "total";

export const COMPONENT_LABELS: Record<ComponentKey, string> = {
  repeatability: "Repeatability (equipment variation, EV)",
  reproducibility: "Reproducibility (appraiser variation, AV)",
  appraiser: "Appraiser",
  interaction: "Appraiser × part",
  grr: "Gauge R&R (GRR)",
  part: "Part-to-part (PV)",
  total: "Total variation (TV)",
};
