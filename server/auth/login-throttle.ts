import { sql } from "drizzle-orm";
import type { Options, Store, IncrementResponse } from "express-rate-limit";
import type { Db } from "../db/client";

/**
 * An express-rate-limit store in PostgreSQL (table login_throttle): every app instance on the database
 * counts the same failed sign-ins, and a restart forgets nothing. One upsert per attempt; a window that
 * has run out starts again at 1.
 */
export class PgThrottleStore implements Store {
  windowMs = 15 * 60 * 1000;
  readonly localKeys = false;

  constructor(
    private readonly db: Db,
    readonly prefix: string,
  ) {}

  init(options: Options) {
    this.windowMs = options.windowMs;
  }

  private key(k: string) {
    return `${this.prefix}${k}`;
  }

  async increment(key: string): Promise<IncrementResponse> {
    const res = await this.db.execute(sql`
      insert into login_throttle (key, hits, reset_at)
      values (${this.key(key)}, 1, now() + ${`${this.windowMs} milliseconds`}::interval)
      on conflict (key) do update set
        hits = case when login_throttle.reset_at <= now() then 1 else login_throttle.hits + 1 end,
        reset_at = case when login_throttle.reset_at <= now() then excluded.reset_at else login_throttle.reset_at end
      returning hits, reset_at`);
    const row = res.rows[0] as { hits: number; reset_at: Date | string };
    return { totalHits: Number(row.hits), resetTime: new Date(row.reset_at) };
  }

  async decrement(key: string) {
    await this.db.execute(sql`update login_throttle set hits = greatest(hits - 1, 0) where key = ${this.key(key)}`);
  }

  async resetKey(key: string) {
    await this.db.execute(sql`delete from login_throttle where key = ${this.key(key)}`);
  }

  async get(key: string) {
    const res = await this.db.execute(sql`select hits, reset_at from login_throttle where key = ${this.key(key)} and reset_at > now()`);
    const row = res.rows[0] as { hits: number; reset_at: Date | string } | undefined;
    return row ? { totalHits: Number(row.hits), resetTime: new Date(row.reset_at) } : undefined;
  }
}

/** Forgets windows that ran out (called now and then; a stale row is harmless, it restarts at 1). */
export async function pruneThrottle(db: Db) {
  await db.execute(sql`delete from login_throttle where reset_at < now() - interval '1 hour'`);
}
