// Investigation words, one name per trigger, state, verdict and disposition for every page (no schema library,
// so a page that only shows them stays light).

/** What opened an investigation (the finding), one investigation per finding. */
export const INVESTIGATION_TRIGGERS = ["as_found_failure", "check_failure", "lost", "damaged"] as const;
export type InvestigationTrigger = (typeof INVESTIGATION_TRIGGERS)[number];

export const TRIGGER_LABELS: Record<InvestigationTrigger, string> = {
  as_found_failure: "As-found out of tolerance at calibration",
  check_failure: "Failed intermediate check",
  lost: "Tool lost",
  damaged: "Tool returned damaged",
};

export const INVESTIGATION_STATUSES = ["open", "closed"] as const;
export type InvestigationStatus = (typeof INVESTIGATION_STATUSES)[number];

/** One name per investigation state, wherever it is shown (lists, the page, filters, the report). */
export const INVESTIGATION_STATUS_LABELS: Record<InvestigationStatus, string> = { open: "Open", closed: "Closed" };

/** The verdict a reading was recorded with, in words (the check sheet's words). */
export const READING_VERDICT_LABELS: Record<"within_limits" | "outside_limits" | "pending", string> = {
  within_limits: "Within limits",
  outside_limits: "Outside limits",
  pending: "Pending",
};

export const DISPOSITION_KINDS = ["no_impact", "remeasure", "notify_owner", "recall"] as const;
export type DispositionKind = (typeof DISPOSITION_KINDS)[number];

export const DISPOSITION_LABELS: Record<DispositionKind, string> = {
  no_impact: "No impact",
  remeasure: "Remeasured",
  notify_owner: "Owner notified",
  recall: "Recall",
};
