import type { DbOrTx } from "../../db/client";
import { auditEvents } from "./audit.table";

export interface AuditEntry {
  actorId: string | null;
  action: string;
  entityType: string;
  entityId: string;
  before?: unknown;
  after?: unknown;
  at?: Date;
}

/** Appends one line to the audit trail, inside the caller's transaction. */
export async function recordAudit(tx: DbOrTx, e: AuditEntry): Promise<void> {
  await tx.insert(auditEvents).values({
    actorId: e.actorId,
    action: e.action,
    entityType: e.entityType,
    entityId: e.entityId,
    before: (e.before ?? null) as object | null,
    after: (e.after ?? null) as object | null,
    ...(e.at ? { at: e.at } : {}),
  });
}
