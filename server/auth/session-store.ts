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

const PgStore = connectPgSimple(session);
type PgStoreOptions = ConstructorParameters<typeof PgStore>[0];

/** connect-pg-simple's store, with the expiry written only when it moved by TOUCH_INTERVAL_MS. */
export class SessionStore extends PgStore {
  readonly #written = new Map<string, number>();

  constructor(options: PgStoreOptions, private readonly touchIntervalMs = TOUCH_INTERVAL_MS) {
    super(options);
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
    super.set(sid, sess, fn);
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
    super.destroy(sid, fn);
  }
}
