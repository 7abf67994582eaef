import { Router, type Request } from "express";
import { Passport } from "passport";
import { Strategy as LocalStrategy } from "passport-local";
import { rateLimit, ipKeyGenerator } from "express-rate-limit";
import { defineRoutes, type SessionUser } from "../http/route";
import type { AppDeps } from "../app-deps";
import { usersService } from "../modules/users/users.service";
import { usersRepository } from "../modules/users/users.repository";
import { cachedSignedInUser } from "../modules/users/signed-in-cache";
import { LoginSchema, UserSchema } from "../../shared/users/users.schemas";
import { Errors } from "../http/errors";
import { z } from "zod";
import { PgThrottleStore } from "./login-throttle";
import type { csrfProtection } from "./csrf";

/**
 * A passport instance of this app's own (never the module-wide singleton, so
 * two apps in one process do not share strategies), wired to the users table;
 * sessions hold only the user id.
 */
export function configurePassport(deps: AppDeps) {
  const passport = new Passport();
  const service = usersService(deps);
  passport.use(
    // The e-mail as the schema reads it (trimmed, lower case): "  Crib@shop " signs in as crib@shop.
    new LocalStrategy({ usernameField: "email", passwordField: "password" }, (email, password, done) => {
      service
        .verifyPassword(email, password)
        .then((u) => done(null, u ? toSessionUser(u) : false))
        .catch(done);
    }),
  );
  passport.serializeUser((user, done) => done(null, (user as SessionUser).id));
  passport.deserializeUser((id: string, done) => {
    // A deactivated person is signed out on their next request (their sessions are deleted too).
    cachedSignedInUser(id, (userId) => usersRepository.findById(deps.db, userId))
      .then((u) => done(null, u && u.active ? toSessionUser(u) : false))
      .catch(done);
  });
  return passport;
}

export function toSessionUser(u: { id: string; email: string; name: string; role: SessionUser["role"] }): SessionUser {
  return { id: u.id, email: u.email, name: u.name, role: u.role };
}

/** The e-mail of a sign-in body as the schema reads it, for counting attempts. */
const emailOf = (req: Request) => String(req.body?.email ?? "").trim().toLowerCase();

export function authRoutes(deps: AppDeps, passport: InstanceType<typeof Passport>, csrf: ReturnType<typeof csrfProtection>) {
  const router = Router();
  const route = defineRoutes(router, deps.registry, "auth");

  // Only failed sign-ins count, kept in PostgreSQL so every instance counts the same. Per address and
  // e-mail (one person's typing does not lock out a shop sharing one address), and per address across
  // e-mails (trying many accounts from one place is slowed too).
  const limiter = (name: string, limit: number, key: (req: Request) => string, message: string) =>
    rateLimit({
      windowMs: 15 * 60 * 1000,
      limit,
      skipSuccessfulRequests: true,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      identifier: name,
      store: new PgThrottleStore(deps.db, `${name}:`),
      keyGenerator: key,
      handler: (_req, res) => {
        res.status(429).json({ error: { code: "too_many_attempts", message } });
      },
    });
  const address = (req: Request) => ipKeyGenerator(req.ip ?? "");
  router.post(
    "/api/auth/login",
    limiter("address", deps.config.LOGIN_ADDRESS_RATE_LIMIT, address, "Too many failed sign-ins from this address; wait 15 minutes and try again."),
    limiter("account", deps.config.LOGIN_RATE_LIMIT, (req) => `${address(req)}|${emailOf(req)}`, "Too many failed sign-ins; wait 15 minutes and try again."),
  );

  route({ method: "get", path: "/api/auth/csrf", summary: "Token for the X-CSRF-Token header", access: "public", response: z.object({ token: z.string() }) }, ({ req, res }) => ({
    token: csrf.token(req, res),
  }));

  route(
    { method: "post", path: "/api/auth/login", summary: "Sign in", access: "public", body: LoginSchema, status: 200, response: z.object({ user: UserSchema, csrfToken: z.string() }) },
    ({ req, res }) =>
      new Promise((resolve, reject) => {
        passport.authenticate("local", (err: unknown, user: SessionUser | false) => {
          if (err) return reject(err);
          if (!user) return reject(Errors.badCredentials());
          // passport 0.7 regenerates the session here (no fixation); the CSRF
          // token lived in the old session, so hand out a fresh one.
          req.login(user, (loginErr) => {
            if (loginErr) return reject(loginErr);
            resolve({ user, csrfToken: csrf.token(req, res, true) });
          });
        })(req, res);
      }),
  );

  route({ method: "post", path: "/api/auth/logout", summary: "Sign out", access: "signedIn", status: 204 }, ({ req }) =>
    new Promise<void>((resolve, reject) => req.logout((err) => (err ? reject(err) : req.session.destroy((e) => (e ? reject(e) : resolve()))))),
  );

  route({ method: "get", path: "/api/auth/me", summary: "Who is signed in", access: "signedIn", response: z.object({ user: UserSchema }) }, ({ user }) => ({ user }));

  return router;
}
