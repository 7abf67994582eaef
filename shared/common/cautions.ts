/**
 * The three cautions shown wherever Tenthwise judges a part or a tool: on
 * screens, check sheets, labels, reports and e-mails alike.
 */
export const CAUTIONS = [
  "Limits must come from the manufacturer's current data for the exact engine model and revision.",
  "Verdicts and flags here support, and never replace, the judgement of appropriately certificated persons, who alone decide airworthiness and return to service under the applicable regulations.",
  "Local regulations and the shop's approved procedures govern.",
] as const;
