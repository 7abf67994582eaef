import { sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";

/**
 * The sheet's row of job_activity (kept by triggers on readings and sign-offs) meets a condition. SIGNED is also the
 * condition of the reading's place guard, tenthwise_reading_place (migration 0024): change both together.
 */
const AWAITING = sql.raw("a.last_reading_at is not null and (a.last_signed_at is null or a.last_reading_at > a.last_signed_at)");
const SIGNED = sql.raw("a.last_signed_at is not null and (a.last_reading_at is null or a.last_reading_at <= a.last_signed_at)");

/**
 * Where a check sheet stands, as SQL conditions on a job id — the one definition the jobs list
 * (?status=open|awaiting_signature|signed) and the overview counts (GET /api/stats/inspection, /mine) share.
 * Read from job_activity, which the database keeps in the transaction of every reading and sign-off.
 *
 * - signed: an inspector signed it and no reading was taken (or corrected) after the latest sign-off;
 * - open: not signed (never signed, or corrected since the last sign-off);
 * - awaiting signature: open and holding at least one reading — an inspector has something to sign.
 */
export function jobState(jobId: AnyPgColumn | SQL) {
  const lastSignedAt = sql<Date | null>`(select a.last_signed_at from job_activity a where a.job_id = ${jobId})`;
  const lastReadingAt = sql<Date | null>`(select a.last_reading_at from job_activity a where a.job_id = ${jobId})`;
  const signed = sql<boolean>`exists (select 1 from job_activity a where a.job_id = ${jobId} and ${SIGNED})`;
  const open = sql<boolean>`(not ${signed})`;
  const awaitingSignature = sql<boolean>`exists (select 1 from job_activity a where a.job_id = ${jobId} and ${AWAITING})`;
  return { lastSignedAt, lastReadingAt, signed, open, awaitingSignature };
}

/** "Awaiting signature" on the row of job_activity aliased `a`: the predicate of job_activity_awaiting_idx. */
export const awaitingSignatureOfActivity: SQL = AWAITING;

/** "Open" on the row of job_activity aliased `a`, outer-joined: a sheet with no row there (nothing read, nothing signed) is open. */
export const openOfActivity: SQL = sql`(not (${SIGNED}))`;

import type { JobListStatus } from "../../../shared/jobs/jobs.schemas";

/** The condition for a list status filter. */
export function jobStatusCondition(jobId: AnyPgColumn | SQL, status: JobListStatus): SQL {
  const s = jobState(jobId);
  return status === "signed" ? s.signed : status === "open" ? s.open : s.awaitingSignature;
}
