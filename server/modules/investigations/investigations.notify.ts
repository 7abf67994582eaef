import { drizzle } from "drizzle-orm/node-postgres";
import type pg from "pg";
import * as schema from "../../db/schema";
import type { Db, DbOrTx, Tx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";
import { recordAudit } from "../audit/audit.repository";
import { INVESTIGATION_CAUTIONS } from "../../../shared/investigations/investigations.schemas";
import { claimPendingNotices, itemTotals, noticeRecipients, pendingNoticeIds, setFinding } from "./investigations.repository";
import type { Recipient, StoredFinding } from "./investigations.types";

/**
 * Works out who is told that an investigation opened (quality, and for every affected job the inspector who
 * signed it and whoever measured) and records them on the investigation as pending, inside the opening
 * transaction. The mail itself goes out only once that transaction has committed (see sendAfterCommit).
 */
export async function recordNotices(tx: Tx, investigationId: string, finding: StoredFinding): Promise<StoredFinding> {
  const { quality, measured, signed } = await noticeRecipients(tx, investigationId);
  // Reasons in the order first met, each once (a set: a busy tool's reader may have measured on a thousand engines).
  const byEmail = new Map<string, { email: string; name: string; reasons: Set<string> }>();
  const add = (u: { email: string; name: string }, reason: string) => {
    const r = byEmail.get(u.email) ?? { email: u.email, name: u.name, reasons: new Set<string>() };
    r.reasons.add(reason);
    byEmail.set(u.email, r);
  };
  for (const u of quality) add(u, "quality");
  for (const u of signed) add(u, `signed the check sheet of engine ${u.engineSerial}`);
  for (const u of measured) add(u, `measured on engine ${u.engineSerial}`);
  const recipients: Recipient[] = [...byEmail.values()].map((r) => ({ email: r.email, name: r.name, reasons: [...r.reasons] }));
  const next: StoredFinding = { ...finding, notifications: { status: "pending", recipients, sentAt: null } };
  await setFinding(tx, investigationId, next);
  return next;
}

/**
 * Sends an investigation's pending notices once its opening transaction has committed. The hook runs inside the
 * caller's transaction and cannot see its end, so the pooled connection's release (which drizzle calls after
 * COMMIT or ROLLBACK) is where delivery starts: still on that connection, it claims the notices — a rolled-back
 * investigation has none to claim — then lets the connection go back to the pool.
 */
export function sendAfterCommit(tx: DbOrTx, mailer: Mailer | undefined, clock: Clock, investigationId: string) {
  if (!mailer) return;
  afterCommit(tx, async (db) => void (await deliverNotices(db, mailer, clock, investigationId)));
}

/**
 * Runs `work` once the caller's transaction has committed, on its connection before that goes back to the pool (the
 * pooled connection's release, which drizzle calls after COMMIT or ROLLBACK). After a ROLLBACK the work finds nothing
 * of what the transaction wrote, so it must look before it acts (a claim, a row still pending). Its failures are left
 * to the minute's sweeps, which look for the same pending rows.
 */
export function afterCommit(tx: DbOrTx, work: (db: Db) => Promise<void>, onError: (err: unknown) => void = () => undefined) {
  const client = (tx as unknown as { session?: { client?: unknown } }).session?.client as (pg.PoolClient & { release: (err?: Error | boolean) => void }) | undefined;
  if (client && typeof client.release === "function") {
    const release = client.release;
    client.release = (err?: Error | boolean) => {
      client.release = release;
      if (err) return release.call(client, err);
      const db = drizzle(client, { schema }) as unknown as Db;
      work(db)
        .then(
          () => release.call(client),
          // A connection that failed mid-work is not handed to the next request.
          (e: unknown) => {
            onError(e);
            release.call(client, e instanceof Error ? e : true);
          },
        );
    };
    return;
  }
  // Not inside a pooled transaction: every statement has already committed.
  queueMicrotask(() => void work(tx as Db).catch(onError));
}

/** Sends every notice still pending (a sweep for notices a crash left behind; the seed uses it too). */
export async function deliverPendingNotices(db: Db, mailer: Mailer, clock: Clock): Promise<number> {
  let sent = 0;
  for (const id of await pendingNoticeIds(db)) sent += await deliverNotices(db, mailer, clock, id);
  return sent;
}

/** Claims the pending notices of one investigation (exactly once), sends them, and records who was told. */
export async function deliverNotices(db: Db, mailer: Mailer, clock: Clock, investigationId: string): Promise<number> {
  const claimed = await claimPendingNotices(db, investigationId);
  if (!claimed) return 0;
  const finding = claimed.finding as StoredFinding;
  const recipients = finding.notifications?.recipients ?? [];
  const c = await itemTotals(db, investigationId);
  let error: string | null = null;
  let sent = 0;
  for (const r of recipients) {
    try {
      await mailer.send(noticeMail(r, finding, investigationId, c));
      sent++;
    } catch (e) {
      error = e instanceof Error ? e.message : String(e);
    }
  }
  const at = clock.now();
  const notifications = { ...finding.notifications!, status: error ? ("failed" as const) : ("sent" as const), sentAt: at.toISOString(), error };
  await setFinding(db, investigationId, { ...finding, notifications });
  await recordAudit(db, {
    actorId: null,
    action: "investigation.notified",
    entityType: "investigation",
    entityId: investigationId,
    after: { recipients: recipients.map((r) => ({ email: r.email, reasons: r.reasons })), sent, error },
    at,
  });
  return sent;
}

function noticeMail(r: Recipient, finding: StoredFinding, id: string, c: { items: number; couldChange: number }) {
  const subject = `Out-of-tolerance investigation opened: ${finding.subject}`;
  const lines = [
    `Hello ${r.name},`,
    "",
    `An out-of-tolerance investigation has opened in Tenthwise: ${finding.summary}`,
    `Affected items: ${c.items}; verdicts that could have been different: ${c.couldChange}.`,
    `You are told because you ${r.reasons.map((x) => (x === "quality" ? "are in quality" : x)).join("; ")}.`,
    "",
    `Open it in Tenthwise under Investigations (/investigations/${id}).`,
    "",
    ...INVESTIGATION_CAUTIONS,
  ];
  return { to: r.email, subject, text: lines.join("\n") };
}
