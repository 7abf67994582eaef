import type { JobListStatus } from "./jobs.schemas";

/**
 * Where a check sheet stands, one name per state for every page (sheet list, sheet, overview, PDF).
 * The same rules as server/modules/jobs/job-state.ts: signed = signed and nothing taken since the last sign-off.
 */
export const JOB_STATES = ["open", "awaiting_signature", "needs_signing_again", "signed"] as const;
export type JobState = (typeof JOB_STATES)[number];

export const JOB_STATE_LABELS: Record<JobState, string> = {
  open: "Open — no readings yet",
  awaiting_signature: "Awaiting signature",
  needs_signing_again: "Corrected since sign-off — needs signing again",
  signed: "Signed",
};

/** Tone of the state's badge: signed is settled, a correction after sign-off needs attention. */
export const JOB_STATE_TONES: Record<JobState, "neutral" | "caution" | "go"> = {
  open: "neutral",
  awaiting_signature: "caution",
  needs_signing_again: "caution",
  signed: "go",
};

/** A sheet's state from what the list or the sheet knows of it. */
export function jobStateOf(s: { signed: boolean; everSigned: boolean; readingCount: number }): JobState {
  if (s.signed) return "signed";
  if (s.everSigned) return "needs_signing_again";
  return s.readingCount > 0 ? "awaiting_signature" : "open";
}

/** From a list row (GET /api/jobs): status open|signed, the latest sign-off instant and the reading count. */
export function jobStateOfSummary(j: { status: "open" | "signed"; signedAt: string | null; readingCount: number }): JobState {
  return jobStateOf({ signed: j.status === "signed", everSigned: j.signedAt !== null, readingCount: j.readingCount });
}

/** From a sheet (GET /api/jobs/:id/sheet): locked, changed since sign-off and places recorded. */
export function jobStateOfSheet(s: { locked: boolean; changedSinceSignoff: boolean; summary: { recorded: number } }): JobState {
  return jobStateOf({ signed: s.locked, everSigned: s.changedSinceSignoff, readingCount: s.summary.recorded });
}

/** The list's status filter (?status=): "open" takes every sheet not signed, whatever its readings. */
export const JOB_LIST_FILTER_LABELS: Record<JobListStatus, string> = {
  open: "Not signed",
  awaiting_signature: JOB_STATE_LABELS.awaiting_signature,
  signed: JOB_STATE_LABELS.signed,
};
