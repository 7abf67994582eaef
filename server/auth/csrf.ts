import { createHmac, randomBytes, timingSafeEqual } from "node:crypto";
import type { NextFunction, Request, Response } from "express";
import { csrfSync } from "csrf-sync";
import { Errors } from "../http/errors";
import { cookieValue } from "../http/cookies";

const COOKIE = "tenthwise.csrf";
const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

/**
 * CSRF protection in two forms (both checked on every POST, PUT, PATCH and DELETE under /api):
 *
 * - signed in: the synchroniser token kept in the session (csrf-sync), header X-CSRF-Token;
 * - not signed in (the sign-in form itself): a signed double-submit cookie (OWASP CSRF cheat sheet,
 *   "signed double-submit cookie"): the token is a nonce and its HMAC under the session secret, the
 *   nonce also sits in an httpOnly SameSite=Strict cookie. No session row is stored for a visitor who
 *   has only asked for a token.
 */
export function csrfProtection(secret: string, secureCookie: boolean) {
  const { csrfSynchronisedProtection, generateToken: sessionToken } = csrfSync({
    getTokenFromRequest: (req) => req.headers["x-csrf-token"] as string | undefined,
  });
  const sign = (nonce: string) => createHmac("sha256", secret).update(`tenthwise-csrf:${nonce}`).digest("base64url");
  const signedIn = (req: Request) => !!req.user || !!(req.session as { csrfToken?: string } | undefined)?.csrfToken;

  function anonymousValid(req: Request): boolean {
    const header = String(req.headers["x-csrf-token"] ?? "");
    const [kind, nonce, mac] = header.split(".");
    if (kind !== "a" || !nonce || !mac) return false;
    const cookie = cookieValue(req.headers.cookie, COOKIE);
    if (!cookie || cookie !== nonce) return false;
    const want = Buffer.from(sign(nonce));
    const got = Buffer.from(mac);
    return want.length === got.length && timingSafeEqual(want, got);
  }

  return {
    /** Middleware: refuses a state-changing request without the right token (403 csrf_token_invalid). */
    protect(req: Request, res: Response, next: NextFunction) {
      if (SAFE.has(req.method)) return next();
      if (signedIn(req)) return csrfSynchronisedProtection(req, res, (err?: unknown) => next(err ? Errors.csrf() : undefined));
      return next(anonymousValid(req) ? undefined : Errors.csrf());
    },
    /** A token for this caller: bound to the session when signed in, else a signed nonce in a cookie. */
    token(req: Request, res: Response, overwrite = false): string {
      if (signedIn(req) || overwrite) return sessionToken(req, overwrite);
      // The same token for as long as the browser keeps the cookie (several tabs, a second fetch).
      const kept = cookieValue(req.headers.cookie, COOKIE);
      if (kept && /^[A-Za-z0-9_-]{24}$/.test(kept)) return `a.${kept}.${sign(kept)}`;
      const nonce = randomBytes(18).toString("base64url");
      res.cookie(COOKIE, nonce, { httpOnly: true, sameSite: "strict", secure: secureCookie, path: "/api" });
      return `a.${nonce}.${sign(nonce)}`;
    },
  };
}
