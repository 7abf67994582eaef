// The one place other modules reach investigations from (calibrations, checks and the crib open them; the check
// sheet asks which readings are suspect). Imports run one way: hooks → service → notify → repository.
import type { DbOrTx, Tx } from "../../db/client";
import { openToolInvestigation } from "./investigations.service";
import { openInvestigationReadingIds } from "./investigations.repository";
import type { Finding, FindingDeps } from "./investigations.types";

export type { Finding, FindingDeps } from "./investigations.types";

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
