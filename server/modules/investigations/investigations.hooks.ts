import type { DbOrTx, Tx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";
import { openToolInvestigation } from "./investigations.service";
import { openInvestigationReadingIds } from "./investigations.repository";

/** What opened an investigation; each is linked to the record that found it. */
export type Finding =
  | { kind: "as_found_failure"; toolId: string; calibrationId: string; at: Date; actorId: string | null }
  | { kind: "check_failure"; toolId: string; checkId: string; at: Date; actorId: string | null }
  | { kind: "lost"; toolId: string; at: Date; actorId: string | null }
  | { kind: "damaged"; toolId: string; checkoutId: string; at: Date; actorId: string | null };

export interface FindingDeps {
  clock: Clock;
  mailer?: Mailer;
  timeZone: string;
}

/**
 * Opens the out-of-tolerance investigation for a finding, inside the caller's
 * transaction (never by someone remembering to). Returns its id, or null when
 * none is opened.
 *
 * One investigation per finding: the window runs from when the tool was last
 * known good up to `finding.at` (both ends inclusive); every reading naming the
 * tool in it (overrides included, superseded ones not) is re-judged with the
 * error found. Quality and the people of each affected job are e-mailed once
 * the caller's transaction has committed (nothing is sent if it rolls back).
 */
export async function onOutOfToleranceFinding(tx: Tx, deps: FindingDeps, finding: Finding): Promise<{ investigationId: string } | null> {
  return openToolInvestigation(tx, deps, finding);
}

/** Readings that belong to an open investigation: their check sheets show the `suspect` flag. */
export async function suspectReadingIds(db: DbOrTx, readingIds: string[]): Promise<Set<string>> {
  return openInvestigationReadingIds(db, readingIds);
}
