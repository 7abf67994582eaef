// Shapes shared by the investigation service, its hooks and its notices. Kept apart so that the three import
// in one direction only: hooks → service → notify → repository (none of them back).
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";
import type { Logger } from "pino";
import type { LengthUnit } from "../../../shared/common/units";

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
  /** Told when gathering an investigation's readings after its finding committed fails (the sweep gathers them later). */
  logger?: Pick<Logger, "warn">;
  /** How many readings an opening re-judges in its own transaction (INLINE_READINGS unless given). */
  inlineReadings?: number;
}

export interface Recipient {
  email: string;
  name: string;
  reasons: string[];
}

/** The `finding` JSON of an investigation. */
export interface StoredFinding {
  /** A short name for mail subjects, e.g. "MIC-0104 (as-found out of tolerance)". */
  subject: string;
  summary: string;
  unit: LengthUnit | null;
  errors: { nominal: number; error: number; uncertainty: number | null; mpe: number | null }[] | null;
  windowRule: string;
  note: string | null;
  checkoutId: string | null;
  knownGood: { source: "calibration" | "check" | "certificate"; id: string | null; at: string } | null;
  notifications: { status: "pending" | "sending" | "sent" | "failed"; recipients: Recipient[]; sentAt: string | null; error?: string | null } | null;
}
