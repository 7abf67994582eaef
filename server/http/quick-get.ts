import type { ErrorRequestHandler, Express, NextFunction, Request, RequestHandler, Response } from "express";
import { unsign } from "cookie-signature";
import etag from "etag";
import { cookieValue } from "./cookies";
import type { RouteRunner, SessionUser } from "./route";

/** A GET a signed-in person asks very often, answered from the caches when they hold everything it needs. */
export interface QuickGet {
  /** Matches the whole request URL (no query string); its groups are the path's parameters, still percent-encoded. */
  pattern: RegExp;
  /** The same answer the route gives (its service call); an error goes to the error handler as the route's would. */
  answer: (params: string[], user: SessionUser) => Promise<unknown>;
}

/**
 * A write a signed-in person makes very often (a reading recorded), taken at the front when the caches hold the session
 * and the request carries that session's CSRF token, then run by its route's own runner (role, input, validation,
 * handler, answer), after the same JSON body parser as the whole way.
 */
export interface QuickWrite {
  /** The route's path as the router has it (`/api/jobs/:id/readings`). */
  path: string;
  run: RouteRunner;
}

/** The signed-in person of a session and the session's CSRF token, from this instance's caches only. */
export interface CachedSession {
  user: SessionUser;
  csrfToken: string | null;
}

export interface QuickGetOptions {
  routes: QuickGet[];
  /** POSTs taken at the front (QuickWrite). */
  writes?: QuickWrite[];
  /** The JSON body parser of the whole way (the same instance, so the same limit and errors). */
  parseJson?: RequestHandler;
  /** Wraps the answer as the whole way's compression of whole JSON answers does (compress-answer.ts). */
  compress?: RequestHandler;
  /** The session cookie as express-session writes it (`s:` + the signed session id). */
  cookie: { name: string; secret: string; secure: boolean; maxAgeMs: number };
  /** The active person signed in to a session id, from this instance's caches only; null sends the request the whole way. */
  signedIn: (sid: string) => CachedSession | null;
  /** The headers every answer carries (the security headers), captured once from their middleware. */
  headers: ReadonlyArray<readonly [string, string]>;
  /** Gives the request its id and request-log line, as the whole way does. */
  begin: (req: Request, res: Response) => void;
  /**
   * Sends a small GET answer in one step with node's own writeHead (headers as one list) instead of Express's res.json:
   * the same status line, headers and body, without the header-by-header bookkeeping. Off when the request log writes
   * the answer's headers (at debug), which it reads from that bookkeeping.
   */
  plainAnswers?: boolean;
}

/** An answer this long or longer goes through res.json and the compression of whole answers (compress-answer.ts THRESHOLD). */
const PLAIN_MAX_BYTES = 1024;

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
 * A write (QuickWrite: a reading recorded) is taken the same way when its body is declared JSON and it carries the
 * session's own CSRF token; its route's own runner does the rest (docs/decisions/026).
 */
export function quickGets(options: QuickGetOptions): RequestHandler {
  const { routes, cookie, signedIn, headers, begin, parseJson, compress } = options;
  const writes = (options.writes ?? []).map((w) => ({ ...w, ...patternOf(w.path) }));
  if (writes.length && !parseJson) throw new Error("quickGets: writes need the JSON body parser");
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
  /** The session's person and the raw cookie when the caches know them, else null (the request goes the whole way). */
  const cachedSession = (req: Request) => {
    if (cookie.secure && !req.secure) return null;
    const raw = cookieValue(req.headers.cookie, cookie.name);
    const sid = raw === null ? null : sessionOf(raw);
    const found = sid === null ? null : signedIn(sid);
    return found && raw !== null ? { ...found, raw } : null;
  };
  /** What every answer taken here carries, as the whole way's middleware would have given it. */
  const start = (req: Request, res: Response, user: SessionUser, raw: string) => {
    begin(req, res);
    req.user = user;
    headed(req, res, raw);
  };
  /** The headers of `start`, set one by one for Express's own sending (res.json, the error handler). */
  const headed = (req: Request, res: Response, raw: string) => {
    for (const [name, value] of headers) res.setHeader(name, value);
    res.setHeader("Set-Cookie", sessionCookieText(raw));
    res.vary("Accept-Encoding");
    compress?.(req, res, () => undefined);
  };
  /** The rolling session cookie, as express-session writes it on every answer (Expires has whole seconds: kept for one). */
  let expiresAt = { second: NaN, text: "" };
  const sessionCookieText = (raw: string) => {
    const expires = Date.now() + cookie.maxAgeMs;
    const second = Math.floor(expires / 1000);
    if (second !== expiresAt.second) expiresAt = { second, text: new Date(expires).toUTCString() };
    return `${cookie.name}=${encodeURIComponent(raw)}; Path=/; Expires=${expiresAt.text}; HttpOnly; SameSite=Lax${cookie.secure ? "; Secure" : ""}`;
  };
  const fixedHeaders = headers.flatMap(([name, value]) => [name, value]);
  /**
   * A 200 JSON answer as res.json sends it (Content-Type, Content-Length, the weak ETag Express makes with the same
   * package), headers and body in one write. A conditional request, or an answer large enough to be compressed, goes
   * through res.json and the compression of whole answers instead.
   */
  const answer = (req: Request, res: Response, out: unknown, raw: string) => {
    const body = JSON.stringify(out);
    const length = Buffer.byteLength(body);
    if (!options.plainAnswers || length >= PLAIN_MAX_BYTES || req.headers["if-none-match"] !== undefined || req.headers["if-modified-since"] !== undefined) {
      headed(req, res, raw);
      return void res.status(200).json(out);
    }
    res.writeHead(200, [
      ...fixedHeaders,
      "Content-Type",
      "application/json; charset=utf-8",
      "Content-Length",
      String(length),
      "ETag",
      etag(body, { weak: true }),
      "Set-Cookie",
      sessionCookieText(raw),
      "Vary",
      "Accept-Encoding",
    ]);
    res.end(body);
  };

  return (req: Request, res: Response, next: NextFunction) => {
    if (req.method === "POST" && writes.length) return quickWrite(req, res, next);
    if (req.method !== "GET") return next();
    const found = firstMatch(routes, req.url);
    if (!found) return next();
    const { item: route, params } = found;
    const session = cachedSession(req);
    if (!session) return next();
    begin(req, res);
    req.user = session.user;
    route
      .answer(params, session.user)
      .then((out) => {
        if (!res.headersSent) answer(req, res, out, session.raw);
      })
      .catch((err: unknown) => {
        if (!res.headersSent) headed(req, res, session.raw);
        next(err);
      });
  };

  function quickWrite(req: Request, res: Response, next: NextFunction) {
    const found = firstMatch(writes, req.url);
    if (!found) return next();
    const { item: write, params: values } = found;
    // Only a JSON body (anything else is the whole way's to refuse), and only with this session's token: a request
    // without it goes the whole way, where the CSRF check refuses it.
    if (!/^application\/json\s*(;|$)/i.test(String(req.headers["content-type"] ?? ""))) return next();
    const session = cachedSession(req);
    const token = req.headers["x-csrf-token"];
    if (!session || !session.csrfToken || typeof token !== "string" || token !== session.csrfToken) return next();
    start(req, res, session.user, session.raw);
    parseJson!(req, res, (err?: unknown) => {
      if (err) return next(err);
      req.params = Object.fromEntries(write.names.map((n, i) => [n, values[i]]));
      write.run(req, res).catch(next);
    });
  }
}

/** Express's application as it dispatches a request (its `handle`, which @types/express does not list). */
type Dispatching = Express & { handle: (req: Request, res: Response, callback?: (err?: unknown) => void) => void };

/**
 * Runs `front` (quickGets) for every request before the app's router rather than as its first middleware: the router's
 * own walk (its layers, path matching and parameter bookkeeping, a new `next` per request) cost as much as the quick
 * path itself saved on its last steps. This does Express's own first step (the `handle` it runs for every request:
 * the request and answer get Express's methods and each other), then `front` answers or passes the request to the
 * router exactly as Express would have; an error from an answer `front` began goes to `onError`, the app's error
 * handler, as it would have from the router.
 */
export function runBeforeRouter(app: Express, front: RequestHandler, onError: ErrorRequestHandler) {
  const dispatching = app as Dispatching;
  const handle = dispatching.handle.bind(app);
  dispatching.handle = (req, res, callback) => {
    req.res = res;
    res.req = req;
    Object.setPrototypeOf(req, app.request);
    Object.setPrototypeOf(res, app.response);
    res.locals ??= Object.create(null);
    // As the router sets them before its first layer.
    req.originalUrl ||= req.url;
    req.baseUrl = "";
    const failed = (err: unknown) => onError(err, req, res, () => undefined);
    // A throw inside `front`, or a promise it returns that rejects, goes to the error handler, as the router's try and
    // promise check around each layer send them: never out of the server's request event, where it would end the
    // process.
    try {
      const returned = front(req, res, (err?: unknown) => (err === undefined ? handle(req, res, callback) : failed(err)));
      if (returned instanceof Promise) returned.catch((err: unknown) => failed(err ?? new Error("the quick path rejected without a reason")));
    } catch (err) {
      failed(err);
    }
  };
}

/** The first of `items` whose pattern matches the whole URL, with the path's parameters; null when none does or a parameter cannot be read. */
function firstMatch<T extends { pattern: RegExp }>(items: readonly T[], url: string): { item: T; params: string[] } | null {
  for (const item of items) {
    const match = item.pattern.exec(url);
    if (!match) continue;
    const params = paramsOf(match);
    return params ? { item, params } : null;
  }
  return null;
}

/** The path's parameters, percent-decoded; null when one cannot be decoded or holds a NUL (the whole way refuses it). */
function paramsOf(match: RegExpExecArray): string[] | null {
  const params: string[] = [];
  for (const p of match.slice(1)) {
    let value: string;
    try {
      value = decodeURIComponent(p);
    } catch {
      return null;
    }
    if (value.includes("\u0000")) return null;
    params.push(value);
  }
  return params;
}

/** A route path with `:name` segments as a pattern over the whole URL (no query string) and the names in order. */
function patternOf(path: string): { pattern: RegExp; names: string[] } {
  const names: string[] = [];
  const source = path
    .split("/")
    .map((seg) => {
      if (seg.startsWith(":")) {
        names.push(seg.slice(1));
        return "([^/?#]+)";
      }
      return seg.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
    })
    .join("/");
  return { pattern: new RegExp(`^${source}$`), names };
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
