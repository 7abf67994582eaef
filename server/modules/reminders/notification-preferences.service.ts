import type { DbOrTx, Tx } from "../../db/client";
import type { Clock } from "../../platform/clock";
import type { SessionUser } from "../../http/route";
import { refused } from "../../http/errors";
import { recordAudit } from "../audit/audit.repository";
import { remindersRepository as repo } from "./reminders.repository";
import { DIGESTS, type DigestKey } from "../../../shared/reminders/reminder-plan";
import { DIGEST_INFO, type NotificationPreferences, type UpdateNotificationPreferences } from "../../../shared/reminders/reminders.schemas";
import type { Role } from "../../../shared/auth/roles";

// Who receives each digest (issue 7): holders of tools, crib attendants, quality.
const DIGEST_ROLES: Record<DigestKey, readonly Role[] | "all"> = {
  myTools: "all",
  crib: ["crib"],
  quality: ["quality"],
  escalations: ["quality"],
};
const LOCKED: ReadonlySet<DigestKey> = new Set(["escalations"]);

const receives = (role: Role, d: DigestKey) => DIGEST_ROLES[d] === "all" || (DIGEST_ROLES[d] as readonly Role[]).includes(role);

function view(role: Role, stored: Record<string, boolean>): NotificationPreferences {
  return {
    digests: DIGESTS.filter((d) => receives(role, d)).map((d) => ({
      digest: d,
      ...DIGEST_INFO[d],
      enabled: LOCKED.has(d) || stored[d] !== false,
      locked: LOCKED.has(d),
    })),
  };
}

/** The digests a person's role receives and whether each is on (everything is on until they turn it off). */
export async function getNotificationPreferences(db: DbOrTx, user: SessionUser): Promise<NotificationPreferences> {
  const row = await repo.findPreferences(db, user.id);
  return view(user.role, row?.digests ?? {});
}

/** Turns digests on or off; escalations stay on, and a digest the role does not receive cannot be chosen. */
export async function updateNotificationPreferences(tx: Tx, clock: Clock, user: SessionUser, patch: UpdateNotificationPreferences): Promise<NotificationPreferences> {
  for (const [key, on] of Object.entries(patch) as [DigestKey, boolean][]) {
    if (LOCKED.has(key) && !on) {
      throw refused("escalations_always_on", "Escalations cannot be turned off: quality must hear about tools still overdue or overdue while issued.");
    }
    if (!receives(user.role, key)) {
      const roles = DIGEST_ROLES[key] as readonly Role[];
      throw refused("digest_not_for_role", `The "${DIGEST_INFO[key].label}" digest goes to ${roles.join(", ")}; your role (${user.role}) does not receive it.`);
    }
  }
  const row = await repo.findPreferences(tx, user.id);
  const before = row?.digests ?? {};
  const after = { ...before, ...patch };
  await repo.savePreferences(tx, user.id, after, clock.now());
  await recordAudit(tx, { actorId: user.id, action: "notification_preferences.update", entityType: "user", entityId: user.id, before, after, at: clock.now() });
  return view(user.role, after);
}
