import { sql, type SQL } from "drizzle-orm";
import type { AnyPgColumn } from "drizzle-orm/pg-core";

/**
 * Where a check sheet stands, as SQL conditions on a job id — the one definition the jobs list
 * (?status=open|awaiting_signature|signed) and the overview counts (GET /api/stats/inspection, /mine) share.
 *
 * - signed: an inspector signed it and no reading was taken (or corrected) after the latest sign-off;
 * - open: not signed (never signed, or corrected since the last sign-off);
 * - awaiting signature: open and holding at least one reading — an inspector has something to sign.
 */
export function jobState(jobId: AnyPgColumn | SQL) {
  const lastSignedAt = sql<Date | null>`(select max(s.signed_at) from job_signoffs s where s.job_id = ${jobId})`;
  const lastReadingAt = sql<Date | null>`(select max(r.taken_at) from readings r where r.job_id = ${jobId})`;
  const signed = sql<boolean>`(${lastSignedAt} is not null and (${lastReadingAt} is null or ${lastReadingAt} <= ${lastSignedAt}))`;
  const open = sql<boolean>`(not ${signed})`;
  const hasReadings = sql<boolean>`exists (select 1 from readings r where r.job_id = ${jobId})`;
  const awaitingSignature = sql<boolean>`(${hasReadings} and ${open})`;
  return { lastSignedAt, lastReadingAt, signed, open, awaitingSignature };
}

import type { JobListStatus } from "../../../shared/jobs/jobs.schemas";

/** The condition for a list status filter. */
export function jobStatusCondition(jobId: AnyPgColumn | SQL, status: JobListStatus): SQL {
  const s = jobState(jobId);
  return status === "signed" ? s.signed : status === "open" ? s.open : s.awaitingSignature;
}
