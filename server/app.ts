import fs from "node:fs";
import path from "node:path";
import zlib from "node:zlib";
import express, { type Request, type Response, type NextFunction } from "express";
import session from "express-session";
import helmet from "helmet";
import compression from "compression";
import { pino } from "pino";
import { OpenApiRegistry } from "./openapi/registry";
import { identifyRequest, requestLog } from "./http/request-log";
import { fixedHeadersOf, quickGets, runBeforeRouter } from "./http/quick-get";
import { compressWholeAnswers } from "./http/compress-answer";
import { errorHandler, isDatabaseUnavailable, sendError } from "./http/error-handler";
import { authRoutes, configurePassport, toSessionUser } from "./auth/auth.routes";
import { signedInUserIfKnown } from "./modules/users/signed-in-cache";
import { csrfProtection } from "./auth/csrf";
import { SessionStore } from "./auth/session-store";
import { moduleRouters, quickGetRoutes, quickWriteRoutes } from "./modules";
import type { AppDeps, AppServices } from "./app-deps";

/** Builds the Express app; only server/index.ts listens. */
export function createApp(services: AppServices) {
  const logger = services.logger ?? pino({ level: services.config.LOG_LEVEL });
  const deps: AppDeps = { ...services, logger, registry: new OpenApiRegistry() };
  const app = express();
  app.set("trust proxy", "loopback");
  app.disable("x-powered-by");

  const securityHeaders = helmet({
    contentSecurityPolicy: {
      directives: {
        "img-src": ["'self'", "data:", "blob:"],
        "media-src": ["'self'", "blob:"],
        "upgrade-insecure-requests": services.config.COOKIE_SECURE ? [] : null,
      },
    },
    strictTransportSecurity: services.config.COOKIE_SECURE,
  });
  const headers = fixedHeadersOf(securityHeaders);
  const logRequest = requestLog();

  // The session table comes with the migrations (the runtime role creates no tables). Pruning is a
  // DELETE of expired rows; two instances pruning at once is harmless. The expiry is moved forward at
  // most every 15 minutes per session, not on every request (server/auth/session-store.ts).
  const store = new SessionStore({
    pool: services.pool,
    tableName: "session",
    createTableIfMissing: false,
    pruneSessionInterval: services.config.NODE_ENV === "test" ? false : 15 * 60,
    errorLog: (...args: unknown[]) => logger.warn({ args }, "session store"),
  });
  const sessionCookie = { name: "tenthwise.sid", secret: services.config.SESSION_SECRET, secure: services.config.COOKIE_SECURE, maxAgeMs: 12 * 60 * 60 * 1000 };

  // The JSON body parser and the compression of whole answers, one instance each for the whole way and the front.
  const parseJson = express.json({ limit: "5mb" });
  const compressWhole = compressWholeAnswers();

  // A tool's status asked, or a reading recorded, with a session and person this instance read moments ago is
  // answered here, before the router and the middleware below, with what they would have added
  // (server/http/quick-get.ts); anything else goes on to the router.
  runBeforeRouter(
    app,
    quickGets({
      routes: quickGetRoutes(deps),
      cookie: sessionCookie,
      writes: quickWriteRoutes(deps),
      parseJson,
      compress: compressWhole,
      signedIn: (sid) => {
        const cached = store.signedInFromCache(sid);
        const person = cached === null ? undefined : signedInUserIfKnown(cached.userId);
        return cached && person && person.active ? { user: toSessionUser(person), csrfToken: cached.csrfToken } : null;
      },
      headers,
      // The request log's details at debug read the answer's headers as Express keeps them.
      plainAnswers: !logger.isLevelEnabled("debug"),
      begin: (req, res) => {
        identifyRequest(req, logger);
        logRequest(req, res, () => undefined);
      },
    }),
    errorHandler,
  );
  // helmet's headers are the same on every answer (no per-request values with these options): set in one step.
  app.use((_req: Request, res: Response, next: NextFunction) => {
    for (const [name, value] of headers) res.setHeader(name, value);
    next();
  });
  // req.id and req.log (a child logger with the request's id). The request line itself is requestLog's: one line
  // at info (method, path, status, ms, user), the headers only at debug.
  app.use((req: Request, _res: Response, next: NextFunction) => {
    identifyRequest(req, logger);
    next();
  });
  app.use(logRequest);
  // Answers and the client's files travel compressed when the browser accepts it; progress streams
  // (application/x-ndjson) are left alone so each line arrives when it is written. Answers are compressed anew for
  // every request, so at the fastest settings: a 1,000-reading check sheet (1.8 MB of JSON) takes about 2 ms in
  // brotli instead of 14 ms, for 46 kB instead of 39 kB. The client's files keep the defaults (smaller, and cached).
  const compressible = (req: Request, res: Response) => !String(res.getHeader("Content-Type") ?? "").startsWith("application/x-ndjson") && compression.filter(req, res);
  const compressAnswer = compression({ filter: compressible, level: 1, brotli: { params: { [zlib.constants.BROTLI_PARAM_QUALITY]: 1 } } });
  const compressFile = compression({ filter: compressible });
  app.use((req, res, next) => (req.path.startsWith("/api/") ? compressAnswer : compressFile)(req, res, next));
  app.use("/api", compressWhole);
  app.use(parseJson);

  app.use(
    session({
      name: sessionCookie.name,
      store,
      secret: sessionCookie.secret,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: "lax", secure: sessionCookie.secure, maxAge: sessionCookie.maxAgeMs },
    }),
  );
  const passport = configurePassport(deps);
  app.use(passport.initialize());
  app.use(passport.session());

  const csrf = csrfProtection(services.config.SESSION_SECRET, services.config.COOKIE_SECURE);
  app.use("/api", (req: Request, res: Response, next: NextFunction) => csrf.protect(req, res, next));

  app.get("/api/health", async (_req, res) => {
    try {
      await services.pool.query("select 1");
      res.json({ ok: true, db: "up" });
    } catch (err) {
      // The documented error shape, with the health fields beside it.
      res.setHeader("Retry-After", "2");
      res.status(503).json({
        ok: false,
        db: "down",
        error: {
          code: "database_unavailable",
          message: isDatabaseUnavailable(err) ? "The database is not reachable right now; the server keeps trying." : "The database did not answer the health check.",
        },
      });
    }
  });
  deps.registry.add({ method: "get", path: "/api/health", summary: "Liveness and database check", tag: "health", permission: "anyone", status: 200 });

  app.use(authRoutes(deps, passport, csrf));
  for (const make of moduleRouters) app.use(make(deps));

  app.get("/api/openapi.json", (_req, res) => {
    res.json(deps.registry.document({ title: "Tenthwise API", version: "1" }));
  });
  app.use("/api", (req, res) => {
    sendError(res, 404, "route_not_found", `There is no ${req.method} ${req.originalUrl.slice(0, 200)} in the Tenthwise API.`);
  });

  const clientDir = services.clientDir ?? path.resolve(process.cwd(), "dist/client");
  if (fs.existsSync(path.join(clientDir, "index.html"))) {
    app.use(express.static(clientDir, { index: false, maxAge: "1h" }));
    // Client-side routes (including the /t/<tag> status page) all load the app.
    app.get("/{*splat}", (_req, res) => res.sendFile(path.join(clientDir, "index.html")));
  }

  app.use(errorHandler);
  return Object.assign(app, { deps });
}
