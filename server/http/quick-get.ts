import type { NextFunction, Request, RequestHandler, Response } from "express";
import { unsign } from "cookie-signature";
import { cookieValue } from "./cookies";
import type { SessionUser } from "./route";

/** A GET a signed-in person asks very often, answered from the caches when they hold everything it needs. */
export interface QuickGet {
  /** Matches the whole request URL (no query string); its groups are the path's parameters, still percent-encoded. */
  pattern: RegExp;
  /** The same answer the route gives (its service call); an error goes to the error handler as the route's would. */
  answer: (params: string[], user: SessionUser) => Promise<unknown>;
}

export interface QuickGetOptions {
  routes: QuickGet[];
  /** The session cookie as express-session writes it (`s:` + the signed session id). */
  cookie: { name: string; secret: string; secure: boolean; maxAgeMs: number };
  /** The active person signed in to a session id, from this instance's caches only; null sends the request the whole way. */
  signedIn: (sid: string) => SessionUser | null;
  /** The headers every answer carries (the security headers), captured once from their middleware. */
  headers: ReadonlyArray<readonly [string, string]>;
  /** Gives the request its id and request-log line, as the whole way does. */
  begin: (req: Request, res: Response) => void;
}

const MAX_VERIFIED = 10_000;

/**
 * The few GETs a mechanic fires at a tablet all day (a tool's status before measuring) cost four times what the
 * database does, nearly all of it in the middleware every request walks through: security headers, logging,
 * compression, body parsing, the session read and its rolling cookie, sign-in, CSRF and the route table. When the
 * session was read by this instance within SESSION_REUSE_MS (and needs no expiry moved) and the person within
 * SIGNED_IN_CACHE_MS, this answers such a GET at the front, with the same headers, cookie, log line, role rule and
 * service call as the whole way; anything else (no cookie, a bad signature, a session or person not in the caches,
 * a query string, an odd path) goes the whole way, which fills the caches. It only answers what the whole way would:
 * a signed-out or deactivated session is dropped from the caches when it ends (session-store.ts, signed-in-cache.ts).
 */
export function quickGets(options: QuickGetOptions): RequestHandler {
  const { routes, cookie, signedIn, headers, begin } = options;
  // Cookie values already checked, each with its session id: the signature of a value never changes.
  const verified = new Map<string, string>();
  const sessionOf = (raw: string): string | null => {
    const known = verified.get(raw);
    if (known !== undefined) return known;
    if (!raw.startsWith("s:")) return null;
    const sid = unsign(raw.slice(2), cookie.secret);
    if (sid === false) return null;
    if (verified.size >= MAX_VERIFIED) verified.clear();
    verified.set(raw, sid);
    return sid;
  };

  return (req: Request, res: Response, next: NextFunction) => {
    if (req.method !== "GET") return next();
    const url = req.url;
    let route: QuickGet | undefined;
    let match: RegExpExecArray | null = null;
    for (const r of routes) {
      match = r.pattern.exec(url);
      if (match) {
        route = r;
        break;
      }
    }
    if (!route || !match) return next();
    const params: string[] = [];
    for (const p of match.slice(1)) {
      let value: string;
      try {
        value = decodeURIComponent(p);
      } catch {
        return next();
      }
      if (value.includes("\u0000")) return next();
      params.push(value);
    }
    if (cookie.secure && !req.secure) return next();
    const raw = cookieValue(req.headers.cookie, cookie.name);
    const sid = raw === null ? null : sessionOf(raw);
    const user = sid === null ? null : signedIn(sid);
    if (!user || raw === null) return next();

    begin(req, res);
    req.user = user;
    for (const [name, value] of headers) res.setHeader(name, value);
    // The rolling session cookie, as express-session writes it on every answer.
    res.setHeader(
      "Set-Cookie",
      `${cookie.name}=${encodeURIComponent(raw)}; Path=/; Expires=${new Date(Date.now() + cookie.maxAgeMs).toUTCString()}; HttpOnly; SameSite=Lax${cookie.secure ? "; Secure" : ""}`,
    );
    res.vary("Accept-Encoding");
    route.answer(params, user).then((out) => {
      if (!res.headersSent) res.status(200).json(out);
    }, next);
  };
}

/** The headers a header-setting middleware (helmet) sets on every answer, captured by running it once. */
export function fixedHeadersOf(middleware: RequestHandler): [string, string][] {
  const set = new Map<string, string>();
  const res = {
    setHeader: (name: string, value: unknown) => void set.set(name, String(value)),
    removeHeader: (name: string) => void set.delete(name),
    getHeader: (name: string) => set.get(name),
  };
  let called = false;
  void middleware({ headers: {} } as Request, res as unknown as Response, () => void (called = true));
  if (!called) throw new Error("the header middleware did not call next() synchronously; its headers cannot be captured");
  return [...set];
}
