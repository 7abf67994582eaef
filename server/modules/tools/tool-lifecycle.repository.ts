import { and, desc, eq, isNull } from "drizzle-orm";
import type { DbOrTx, Tx } from "../../db/client";
import { holds, toolLifecycleEvents, tools } from "./tools.table";
import { recordAudit } from "../audit/audit.repository";
import { refused } from "../../http/errors";

export type Lifecycle = "active" | "inactive" | "lost" | "retired";

/**
 * Moves a tool to a lifecycle state (inactive, lost, retired, or back to
 * active when found or reactivated): an event for the history, the current
 * value on the tool, a line in the audit trail. Call inside a transaction.
 */
export async function changeLifecycle(tx: Tx, args: { toolId: string; lifecycle: Lifecycle; reason: string; actorId: string | null; at: Date }) {
  const tool = await lockTool(tx, args.toolId);
  if (!tool) throw new Error(`tool ${args.toolId} missing`);
  if (tool.lifecycle === "retired") throw refused("tool_retired", `${tool.assetTag} is retired; a retired tool does not come back into use.`);
  if (tool.lifecycle === args.lifecycle) throw refused("lifecycle_unchanged", `${tool.assetTag} is already ${args.lifecycle}.`);
  await tx.insert(toolLifecycleEvents).values({ toolId: args.toolId, at: args.at, byUserId: args.actorId, lifecycle: args.lifecycle, reason: args.reason });
  await tx.update(tools).set({ lifecycle: args.lifecycle }).where(eq(tools.id, args.toolId));
  await recordAudit(tx, {
    actorId: args.actorId,
    action: `tool.lifecycle.${args.lifecycle}`,
    entityType: "tool",
    entityId: tool.assetTag,
    before: { lifecycle: tool.lifecycle },
    after: { lifecycle: args.lifecycle, reason: args.reason },
    at: args.at,
  });
  return { from: tool.lifecycle, to: args.lifecycle };
}

/**
 * Locks a tool's row for the rest of the transaction, so simultaneous changes of its lifecycle or holds
 * (twenty "lost" reports, twenty releases) run one after another and each sees the one before: exactly
 * one succeeds. NO KEY UPDATE, not UPDATE: rows that merely reference the tool (checks, checkouts) take
 * KEY SHARE locks, which this does not wait for, so those inserts never deadlock against it.
 */
export async function lockTool(tx: Tx, toolId: string) {
  const [tool] = await tx.select().from(tools).where(eq(tools.id, toolId)).for("no key update");
  return tool;
}

/** The open quarantine hold of a tool, if any. */
export function openHold(tx: DbOrTx, toolId: string) {
  return tx.query.holds.findFirst({ where: and(eq(holds.toolId, toolId), isNull(holds.releasedAt)), orderBy: desc(holds.placedAt) });
}

/** Quarantines a tool (damaged, dropped, suspect); refused when it already is. */
export async function placeHold(tx: Tx, args: { toolId: string; reason: string; actorId: string | null; at: Date }) {
  await lockTool(tx, args.toolId);
  if (await openHold(tx, args.toolId)) throw refused("already_quarantined", "This tool is already quarantined.");
  const [hold] = await tx.insert(holds).values({ toolId: args.toolId, placedAt: args.at, placedBy: args.actorId, reason: args.reason }).returning();
  await recordAudit(tx, { actorId: args.actorId, action: "tool.quarantine", entityType: "tool_hold", entityId: hold.id, after: hold, at: args.at });
  return hold;
}

/** Releases the open hold with a reason; the caller decides whether the rules allow release. */
export async function releaseHold(tx: Tx, args: { toolId: string; reason: string; actorId: string | null; at: Date }) {
  await lockTool(tx, args.toolId);
  const hold = await openHold(tx, args.toolId);
  if (!hold) throw refused("not_quarantined", "This tool is not quarantined.");
  const [after] = await tx
    .update(holds)
    .set({ releasedAt: args.at, releasedBy: args.actorId, releaseReason: args.reason })
    .where(and(eq(holds.id, hold.id), isNull(holds.releasedAt)))
    .returning();
  if (!after) throw refused("not_quarantined", "This tool was released a moment ago by someone else.");
  await recordAudit(tx, { actorId: args.actorId, action: "tool.release", entityType: "tool_hold", entityId: hold.id, before: hold, after, at: args.at });
  return after;
}
