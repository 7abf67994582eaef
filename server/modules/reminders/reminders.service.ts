import { createHash } from "node:crypto";
import type pg from "pg";
import { sql, type SQL } from "drizzle-orm";
import type { Logger } from "pino";
import type { Db, DbOrTx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { Mailer } from "../../platform/mailer";
import type { Config } from "../../config";
import { getSettings } from "../settings/settings.service";
import { statusesIn, type StatusContext, type ToolFacts, type ToolStatusView } from "../tools/tool-status.service";
import { eventsAfter, statusNow } from "../tools/tool-states.sql";
import { isoInstant, pgArray } from "../../db/values";
import { recordAudit } from "../audit/audit.repository";
import { remindersRepository as repo, type ClaimedReminder } from "./reminders.repository";
import { renderDigest, type DigestLine } from "./reminder-digest";
import { planReminderMap, type DigestKey, type PlannedReminder, type ReminderStage, type ToolForReminders } from "../../../shared/reminders/reminder-plan";
import type { ReminderTrigger, RunRemindersResult } from "../../../shared/reminders/reminders.schemas";
import { addDays, calendarDate } from "../../../shared/common/dates";

/** How a failed SMTP delivery is tried again; tests pass a sleep that does not wait. */
export interface RetryPolicy {
  attempts: number;
  backoffMs: (attempt: number) => number;
  sleep: (ms: number) => Promise<void>;
}

/** Three tries, waiting 2 s then 8 s: rides out a relay's brief hiccup without holding the run for long. */
export const DEFAULT_RETRY: RetryPolicy = {
  attempts: 3,
  backoffMs: (attempt) => 2000 * 4 ** (attempt - 1),
  sleep: (ms) => new Promise((resolve) => setTimeout(resolve, ms)),
};

export interface RemindersDeps {
  db: Db;
  /** Where the run lock's dedicated connection comes from (defaults to the Drizzle handle's pool). */
  pool?: pg.Pool;
  clock: Clock;
  mailer: Mailer;
  config: Pick<Config, "SHOP_TIME_ZONE" | "PUBLIC_URL" | "PORT">;
  logger?: Pick<Logger, "info" | "warn" | "error">;
  retry?: RetryPolicy;
}

export interface RunOptions {
  trigger: ReminderTrigger;
  /** The admin who ran it by hand, for the audit trail. */
  actorId?: string;
  /** Test seams: after the claim is committed, and after each digest is sent (throwing there simulates a crash). */
  hooks?: { afterClaim?: () => Promise<void> | void; afterSend?: (sentSoFar: number) => Promise<void> | void };
}

// One application-wide key for pg_try_advisory_lock: every instance of Tenthwise
// on the same database competes for it, so only one run sends at a time.
const RUN_LOCK_KEY = "7301455120";

/** Base of the links in mail: PUBLIC_URL when the shop set one, else the loopback address of this server. */
export function publicBaseUrl(config: Pick<Config, "PUBLIC_URL" | "PORT">): string {
  return (config.PUBLIC_URL ?? `http://127.0.0.1:${config.PORT}`).replace(/\/+$/, "");
}

function poolOf(deps: RemindersDeps): pg.Pool {
  return deps.pool ?? (deps.db as unknown as { $client: pg.Pool }).$client;
}

/**
 * Runs the due-reminder job once: under the run lock, works out every
 * reminder due now, claims the ones not yet sent in one transaction (the
 * reminder log's unique key makes each exactly once), then sends one digest
 * per recipient, retrying SMTP failures, and records the outcome.
 */
export async function runReminders(deps: RemindersDeps, opts: RunOptions): Promise<RunRemindersResult> {
  const { db, clock } = deps;
  const startedAt = clock.now();
  const lockConn = await poolOf(deps).connect();
  let broken: Error | undefined;
  try {
    const got = await lockConn.query<{ locked: boolean }>("select pg_try_advisory_lock($1::bigint) as locked", [RUN_LOCK_KEY]);
    if (!got.rows[0].locked) {
      const run = await repo.insertRun(db, { trigger: opts.trigger, startedAt, finishedAt: startedAt, status: "skipped_locked", error: "Another run was already sending reminders." });
      return { sent: 0, skipped: 0, failed: 0, reminders: 0, runId: run.id, status: "skipped_locked" };
    }
    try {
      return await runLocked(deps, opts, startedAt);
    } finally {
      await lockConn.query("select pg_advisory_unlock($1::bigint)", [RUN_LOCK_KEY]).catch((e: Error) => (broken = e));
    }
  } finally {
    // A connection whose unlock failed is discarded, which ends its session and so its lock.
    lockConn.release(broken);
  }
}

async function runLocked(deps: RemindersDeps, opts: RunOptions, startedAt: Date): Promise<RunRemindersResult> {
  const { db, clock } = deps;
  await repo.closeInterruptedRuns(db, startedAt);
  const run = await repo.insertRun(db, { trigger: opts.trigger, startedAt, status: "running" });
  if (opts.actorId) await recordAudit(db, { actorId: opts.actorId, action: "reminders.run", entityType: "reminder_run", entityId: run.id, at: startedAt });
  try {
    const world = await gatherWorld(deps, startedAt);
    const planned = world.planned;
    // Reminders sent by an earlier run are left out before claiming; the claim still refuses any a run sent meanwhile.
    const toClaim: PlannedReminder[] = [];
    for (const [key, p] of planned) if (!world.sentBefore.has(key)) toClaim.push(p);
    const claimed = await db.transaction(async (tx) => {
      const rows = toClaim.length ? await repo.claim(tx, run.id, startedAt, toClaim) : [];
      await repo.updateRun(tx, run.id, { skipped: planned.size - rows.length });
      return rows;
    });
    await opts.hooks?.afterClaim?.();
    const lineFor = claimed.length ? await digestLines(db, [...new Set(claimed.map((r) => r.toolId))], startedAt, world.ctx, world.people, world.baseUrl) : null;

    const byRecipient = new Map<string, ClaimedReminder[]>();
    for (const r of claimed) {
      const list = byRecipient.get(r.recipientId);
      if (list) list.push(r);
      else byRecipient.set(r.recipientId, [r]);
    }
    let sent = 0;
    let failed = 0;
    for (const [recipientId, rows] of byRecipient) {
      const person = world.people.get(recipientId)!;
      const mail = renderDigest({
        recipient: person,
        shopName: world.shopName,
        baseUrl: world.baseUrl,
        lines: rows.map((r) => lineFor!(r.toolId, r.stage as ReminderStage)),
      });
      // The same reminders to the same person keep one Message-ID, so a digest re-sent after a crash
      // (sent, then the process died before recording it) is recognised as the same message.
      const messageId = `<reminders-${createHash("sha256").update(`${recipientId}:${rows.map((r) => r.id).sort().join(",")}`).digest("hex").slice(0, 32)}@tenthwise>`;
      const outcome = await sendWithRetry(deps, () => deps.mailer.send({ ...mail, messageId }));
      const ids = rows.map((r) => r.id);
      if (outcome.ok) {
        sent++;
        await repo.markSent(db, ids, clock.now(), outcome.attempts);
      } else {
        failed++;
        deps.logger?.warn({ to: person.email, err: outcome.error }, "reminder digest could not be sent");
        await repo.markFailed(db, ids, outcome.attempts, outcome.error);
      }
      await repo.updateRun(db, run.id, { sent, failed });
      await opts.hooks?.afterSend?.(sent);
    }
    const finished = await repo.updateRun(db, run.id, {
      status: "finished",
      finishedAt: clock.now(),
      sent,
      failed,
      error: failed ? `${failed} digest${failed === 1 ? "" : "s"} could not be sent after ${(deps.retry ?? DEFAULT_RETRY).attempts} tries; the next run tries again.` : null,
    });
    deps.logger?.info({ runId: run.id, sent, failed, skipped: finished.skipped }, "reminder run finished");
    return { sent, skipped: finished.skipped, failed, reminders: claimed.length, runId: run.id, status: "finished" };
  } catch (e) {
    await repo.updateRun(db, run.id, { status: "failed", finishedAt: clock.now(), error: (e as Error).message || String(e) });
    throw e;
  }
}

async function sendWithRetry(deps: RemindersDeps, send: () => Promise<void>): Promise<{ ok: true; attempts: number } | { ok: false; attempts: number; error: string }> {
  const policy = deps.retry ?? DEFAULT_RETRY;
  let lastError = "";
  for (let attempt = 1; attempt <= policy.attempts; attempt++) {
    try {
      await send();
      return { ok: true, attempts: attempt };
    } catch (e) {
      lastError = (e as Error).message || String(e);
      if (attempt < policy.attempts) await policy.sleep(policy.backoffMs(attempt));
    }
  }
  return { ok: false, attempts: policy.attempts, error: lastError };
}

interface Person {
  id: string;
  name: string;
  email: string;
  role: string;
  digests: Record<string, boolean> | null;
}

/** True when the person wants this digest; escalations cannot be turned off. */
function wants(p: Person, digest: DigestKey): boolean {
  return digest === "escalations" || p.digests?.[digest] !== false;
}

/** A derived status as the plan reads it. */
function forPlan(s: ToolStatusView, f: ToolFacts): ToolForReminders {
  return {
    toolId: s.toolId,
    status: s.status,
    dueAt: s.dueAt,
    daysToDue: s.daysToDue,
    usageLimit: f.usageLimit,
    usesRemaining: s.usesRemaining,
    ownerUserId: f.ownerType === "personal" ? f.ownerUserId : null,
    custodian: s.custodian ? { userId: s.custodian.userId, dueBackAt: s.custodian.dueBackAt } : null,
  };
}

/**
 * What the plan reads of every candidate at `at`. The database works it out from tool_states for the present (the
 * status by statusCase, the same rules as the derivation); a tool with an event recorded after `at` is derived from
 * the records as they stood then. Only the tools a reminder is sent about are later derived in full, for their lines.
 */
export async function reminderPlanInputs(db: DbOrTx, candidates: SQL, at: Date, ctx: StatusContext): Promise<{ tools: ToolForReminders[]; sentBefore: Set<string> }> {
  const rows = await repo.planFacts(db, candidates, at, statusNow(at, ctx));
  const out: ToolForReminders[] = [];
  const unsettled: string[] = [];
  const sentBefore = new Set<string>();
  for (const r of rows) {
    // The database gives "due date|stage|recipient"; the tool's id before it makes the reminderKey.
    if (r.sent) for (const k of r.sent.split(",")) sentBefore.add(`${r.id}|${k}`);
    if (!r.settled) {
      unsettled.push(r.id);
      continue;
    }
    out.push({
      toolId: r.id,
      status: r.status,
      dueAt: r.due_at,
      daysToDue: r.days_to_due == null ? null : Number(r.days_to_due),
      usageLimit: r.usage_limit == null ? null : Number(r.usage_limit),
      usesRemaining: r.uses_remaining == null ? null : Number(r.uses_remaining),
      ownerUserId: r.owner_user_id,
      custodian: r.custody_user_id != null ? { userId: r.custody_user_id, dueBackAt: isoInstant(r.custody_due_back)! } : null,
    });
  }
  if (unsettled.length) {
    const { views, tools } = await statusesIn(db, sql`select unnest(${pgArray(unsettled)}::uuid[])`, at, ctx);
    for (const v of views.values()) out.push(forPlan(v, tools.get(v.toolId)!));
  }
  return { tools: out, sentBefore };
}

/** Everything the run decides from: what the plan reads of each candidate, what was sent before, people and preferences. */
async function gatherWorld(deps: RemindersDeps, at: Date) {
  const { db, config } = deps;
  const settings = await getSettings(db, config.SHOP_TIME_ZONE);
  const tz = settings.shopTimeZone;
  const today = calendarDate(at, tz);
  const horizon = addDays(today, Math.max(...settings.reminderStages));
  const candidates = (await eventsAfter(db, at)) ? repo.candidateToolIdsFromRecords(at, horizon) : repo.candidateToolIds(at, horizon);
  const ctx = { timeZone: tz, dueSoonDays: settings.dueSoonDays };
  const { tools, sentBefore } = await reminderPlanInputs(db, candidates, at, ctx);

  const holderIds = new Set<string>();
  for (const t of tools) {
    if (t.ownerUserId) holderIds.add(t.ownerUserId);
    if (t.custodian) holderIds.add(t.custodian.userId);
  }
  const people = new Map<string, Person>((await repo.people(db, [...holderIds], ["crib", "quality"])).map((p) => [p.id, p]));
  const withRole = (role: string) => [...people.values()].filter((p) => p.role === role).map((p) => p.id);

  const planned = planReminderMap({
    tools,
    at: at.toISOString(),
    today,
    dayOf: (instant) => calendarDate(instant, tz),
    stages: settings.reminderStages,
    escalationDays: settings.escalationDays,
    cribIds: withRole("crib"),
    qualityIds: withRole("quality"),
  });
  for (const [key, p] of planned) {
    const person = people.get(p.recipientId);
    if (person === undefined || !wants(person, p.digest)) planned.delete(key);
  }
  return { planned, sentBefore, people, ctx, baseUrl: publicBaseUrl(config), shopName: settings.shopName };
}

/** How each reminder about these tools reads in a digest: from each tool's status at `at`, derived in full. */
async function digestLines(db: Db, toolIds: string[], at: Date, ctx: StatusContext, people: Map<string, Person>, baseUrl: string) {
  const { views: statuses, tools: facts } = await statusesIn(db, sql`select unnest(${pgArray(toolIds)}::uuid[])`, at, ctx);
  const tz = ctx.timeZone;
  const clockTime = new Intl.DateTimeFormat("en-GB", { timeZone: tz, hour: "2-digit", minute: "2-digit", hourCycle: "h23" });
  const when = (instant: string) => `${calendarDate(instant, tz)} ${clockTime.format(new Date(instant))}`;
  const plural = (n: number, what: string) => `${n} ${what}${n === 1 ? "" : "s"}`;

  return function lineFor(toolId: string, stage: ReminderStage): DigestLine {
    const s = statuses.get(toolId)!;
    const f = facts.get(toolId)!;
    const days = s.daysToDue ?? 0;
    // Only the line's own stage is worded (a digest may hold thousands of lines).
    const detail = (): string => {
      switch (stage) {
        case "overdue":
          return `${plural(-days, "day")} overdue; do not use until recalibrated`;
        case "usage_low":
          return `${plural(s.usesRemaining ?? 0, "use")} left of ${f.usageLimit}`;
        case "usage_limit":
          return `all ${f.usageLimit} uses since calibration taken; recalibrate before further use`;
        case "not_returned":
          return s.custodian ? `was due back ${when(s.custodian.dueBackAt)}` : "";
        case "escalation":
          return `${days < 0 ? `${plural(-days, "day")} overdue` : "usage limit reached"}${s.custodian ? " and still issued" : ""}`;
        default:
          return days === 0 ? "runs out today; usable until the end of the day" : `in ${plural(days, "day")}`;
      }
    };
    const owner = f.ownerType === "personal" ? (people.get(f.ownerUserId ?? "")?.name ?? f.ownerName ?? "its owner") : null;
    const c = s.custodian;
    return {
      stage,
      assetTag: s.assetTag,
      description: f.description,
      dueAt: s.dueAt,
      detail: detail(),
      where: c ? `Issued out of the crib${f.location ? ` (kept at ${f.location})` : ""}` : (f.location ?? (owner ? "With its owner" : "In the crib")),
      who: c ? `${c.name} (${c.email}), since ${when(c.since)}` : owner ? `${owner} (owner)` : "Nobody: not issued",
      link: `${baseUrl}/tools/${encodeURIComponent(s.assetTag)}`,
    };
  };
}
