import type { DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";

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
 */
export async function onOutOfToleranceFinding(_tx: DbOrTx, _deps: FindingDeps, _finding: Finding): Promise<{ investigationId: string } | null> {
  return null;
}

/** Readings that belong to an open investigation: their check sheets show the `suspect` flag. */
export async function suspectReadingIds(_db: DbOrTx, _readingIds: string[]): Promise<Set<string>> {
  return new Set();
}
