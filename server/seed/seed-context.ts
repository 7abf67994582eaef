import type { Db } from "../db/client";
import type { Clock } from "../platform/clock";
import type { Config } from "../config";
import type { Mailer } from "../platform/mailer";
import type { ObjectStorage } from "../platform/storage";
import type { UserRow } from "../modules/users/users.repository";

/** What every part of the demo seed gets; parts run in order and may leave things for later parts in `shared`. */
export interface SeedContext {
  db: Db;
  clock: Clock;
  config: Config;
  mailer: Mailer;
  storage: ObjectStorage | null;
  /** The six demo sign-ins by role, plus more invented shop people by key. */
  users: Record<"admin" | "quality" | "inspector" | "crib" | "mechanic" | "auditor", UserRow>;
  people: Record<string, UserRow>;
  /** Scratch space between seed parts (ids of demo records). */
  shared: Record<string, unknown>;
}

/** Every demo record is invented; the UI and the records say so. */
export const DEMO_LABEL = "Demo data (invented)";
