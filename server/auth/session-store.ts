import session from "express-session";
import connectPgSimple from "connect-pg-simple";

/**
 * How often one instance moves a session's expiry forward in the database. A session stays alive while
 * its holder is active (rolling expiry); writing the row on every request only to move the expiry by a
 * few seconds cost one UPDATE per request, so the expiry is moved at most this often per session. A
 * session therefore ends between maxAge − TOUCH_INTERVAL_MS and maxAge after its last request.
 */
export const TOUCH_INTERVAL_MS = 15 * 60 * 1000;
const MAX_TRACKED = 20_000;

/**
 * How long one instance reuses a session it read from the database. Most requests only read their session, and
 * that read was half of what a status lookup cost the database; a session changed or ended through this instance
 * (sign-in, sign-out, a password reset, a deactivation) is dropped from it at once, and one ended through another
 * instance is seen here within this time (as the signed-in person is: signed-in-cache.ts).
 */
export const SESSION_REUSE_MS = 5_000;
const MAX_CACHED = 5_000;

/** Every store of this process (weakly held), so that ending a person's sessions drops them from each one's cache. */
const stores = new Set<WeakRef<SessionStore>>();

/** Drops every cached session of a person from every store of this process (their stored sessions were deleted). */
export function forgetSessionsOf(userId: string) {
  for (const ref of stores) {
    const store = ref.deref();
    if (store) store.forgetUser(userId);
    else stores.delete(ref);
  }
}

const PgStore = connectPgSimple(session);
type PgStoreOptions = ConstructorParameters<typeof PgStore>[0];

/** connect-pg-simple's store, with the expiry written only when it moved by TOUCH_INTERVAL_MS. */
export class SessionStore extends PgStore {
  readonly #written = new Map<string, number>();
  readonly #cached = new Map<string, { at: number; json: string; userId: string | null; csrfToken: string | null; expires: number }>();
  /** Moves on every change or end of a session here, so a read that was in flight across one is not cached. */
  #epoch = 0;

  constructor(options: PgStoreOptions, private readonly touchIntervalMs = TOUCH_INTERVAL_MS) {
    super(options);
    stores.add(new WeakRef(this));
  }

  #cache(sid: string, sess: session.SessionData | null | undefined) {
    if (!sess) {
      this.#cached.delete(sid);
      return;
    }
    if (this.#cached.size >= MAX_CACHED) this.#cached.clear();
    const expires = sess.cookie?.expires ? new Date(sess.cookie.expires).getTime() : Infinity;
    const userId = (sess as { passport?: { user?: string } }).passport?.user ?? null;
    const token = (sess as { csrfToken?: unknown }).csrfToken;
    this.#cached.set(sid, { at: Date.now(), json: JSON.stringify(sess), userId, csrfToken: typeof token === "string" ? token : null, expires });
  }

  override get(sid: string, fn: (err: unknown, session?: session.SessionData | null) => void) {
    const hit = this.#cached.get(sid);
    const now = Date.now();
    if (hit && now - hit.at < SESSION_REUSE_MS && hit.expires > now) {
      fn(null, JSON.parse(hit.json) as session.SessionData);
      return;
    }
    const epoch = this.#epoch;
    super.get(sid, (err: unknown, sess?: session.SessionData | null) => {
      // A sign-out (or a password reset) that ran while this read was in flight must not be undone by caching it.
      if (!err && epoch === this.#epoch) this.#cache(sid, sess);
      fn(err, sess);
    });
  }

  /**
   * The person signed in to session `sid` and the session's CSRF token, when this instance read the session within SESSION_REUSE_MS, it has not
   * expired and its expiry does not need moving now; else null, and the request goes the whole way (express-session
   * reads, touches and caches it). What a request answered from the caches alone may rely on (server/http/quick-get.ts).
   */
  signedInFromCache(sid: string): { userId: string; csrfToken: string | null } | null {
    const hit = this.#cached.get(sid);
    const now = Date.now();
    if (!hit || !hit.userId || now - hit.at >= SESSION_REUSE_MS || hit.expires <= now) return null;
    const written = this.#written.get(sid);
    if (written === undefined || now - written >= this.touchIntervalMs) return null;
    return { userId: hit.userId, csrfToken: hit.csrfToken };
  }

  /** Forget the cached sessions of one person. */
  forgetUser(userId: string) {
    this.#epoch++;
    for (const [sid, c] of this.#cached) if (c.userId === userId) this.#cached.delete(sid);
  }

  #remember(sid: string) {
    if (this.#written.size >= MAX_TRACKED) {
      const stale = Date.now() - this.touchIntervalMs;
      for (const [k, at] of this.#written) if (at < stale) this.#written.delete(k);
      if (this.#written.size >= MAX_TRACKED) this.#written.clear();
    }
    this.#written.set(sid, Date.now());
  }

  override set(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void) {
    this.#remember(sid);
    this.#cached.delete(sid);
    const epoch = ++this.#epoch;
    super.set(sid, sess, (err?: unknown) => {
      if (!err && epoch === this.#epoch) this.#cache(sid, sess);
      fn?.(err);
    });
  }

  override touch(sid: string, sess: session.SessionData, fn?: (err?: unknown) => void) {
    const last = this.#written.get(sid);
    if (last !== undefined && Date.now() - last < this.touchIntervalMs) {
      fn?.();
      return;
    }
    this.#remember(sid);
    super.touch(sid, sess, fn);
  }

  override destroy(sid: string, fn?: (err?: unknown) => void) {
    this.#written.delete(sid);
    this.#cached.delete(sid);
    this.#epoch++;
    super.destroy(sid, fn);
  }
}
