import type { UserRow } from "./users.repository";

/**
 * The signed-in person as the last request read them, reused for a few seconds so that a burst of
 * requests (a tablet polling, a list and its counts) does not read the users row each time. A change
 * of role, name or active flag made through this process drops the entry at once; one made by
 * another instance on the same database is seen within SIGNED_IN_CACHE_MS. Deactivating someone also
 * deletes their sessions (and drops them from this instance's session cache), which ends them here at once and
 * on other instances within SESSION_REUSE_MS (server/auth/session-store.ts).
 */
export const SIGNED_IN_CACHE_MS = 5_000;
const MAX_ENTRIES = 5_000;

type Cached = Pick<UserRow, "id" | "email" | "name" | "role" | "active">;
const entries = new Map<string, { at: number; user: Promise<Cached | undefined>; known?: Cached | null }>();

export async function cachedSignedInUser(id: string, read: (id: string) => Promise<Cached | undefined>): Promise<Cached | undefined> {
  const now = Date.now();
  const hit = entries.get(id);
  if (hit && now - hit.at < SIGNED_IN_CACHE_MS) return hit.user;
  if (entries.size >= MAX_ENTRIES) entries.clear();
  const user = read(id).then((u) => (u ? { id: u.id, email: u.email, name: u.name, role: u.role, active: u.active } : undefined));
  const entry: { at: number; user: Promise<Cached | undefined>; known?: Cached | null } = { at: now, user };
  entries.set(id, entry);
  user.then(
    (u) => void (entry.known = u ?? null),
    () => entries.get(id) === entry && entries.delete(id),
  );
  return user;
}

/** The person as read within SIGNED_IN_CACHE_MS, if that read has finished; else undefined (read them the usual way). */
export function signedInUserIfKnown(id: string): Cached | null | undefined {
  const hit = entries.get(id);
  return hit && Date.now() - hit.at < SIGNED_IN_CACHE_MS ? hit.known : undefined;
}

/** Forget one person (their role, name or active flag changed). */
export function forgetSignedInUser(id: string) {
  entries.delete(id);
}
