// The statuses a tool can have and their words; tool-status.ts derives which one applies.

export const TOOL_STATUSES = [
  "in_calibration",
  "due_soon",
  "limited",
  "overdue",
  "out_of_tolerance",
  "quarantined",
  "at_calibration",
  "never_calibrated",
  "inactive",
  "lost",
  "retired",
  "reference_only",
] as const;
export type ToolStatus = (typeof TOOL_STATUSES)[number];

/** Short human labels for each status. */
export const STATUS_LABELS: Record<ToolStatus, string> = {
  in_calibration: "In calibration",
  due_soon: "Due soon",
  limited: "Limited use",
  overdue: "Overdue",
  out_of_tolerance: "Out of tolerance",
  quarantined: "Quarantined",
  at_calibration: "At calibration lab",
  never_calibrated: "Never calibrated",
  inactive: "Inactive",
  lost: "Lost",
  retired: "Retired",
  reference_only: "Reference only",
};
