import fs from "node:fs";
import path from "node:path";
import express, { type Request, type Response, type NextFunction } from "express";
import session from "express-session";
import connectPgSimple from "connect-pg-simple";
import helmet from "helmet";
import { pinoHttp } from "pino-http";
import { pino } from "pino";
import { csrfSync } from "csrf-sync";
import { OpenApiRegistry } from "./openapi/registry";
import { errorHandler } from "./http/error-handler";
import { Errors } from "./http/errors";
import { authRoutes, configurePassport } from "./auth/auth.routes";
import { moduleRouters } from "./modules";
import type { AppDeps, AppServices } from "./app-deps";

/** Builds the Express app; only server/index.ts listens. */
export function createApp(services: AppServices) {
  const logger = services.logger ?? pino({ level: services.config.LOG_LEVEL });
  const deps: AppDeps = { ...services, logger, registry: new OpenApiRegistry() };
  const app = express();
  app.set("trust proxy", "loopback");
  app.disable("x-powered-by");

  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          "img-src": ["'self'", "data:", "blob:"],
          "media-src": ["'self'", "blob:"],
          "upgrade-insecure-requests": services.config.COOKIE_SECURE ? [] : null,
        },
      },
      strictTransportSecurity: services.config.COOKIE_SECURE,
    }),
  );
  app.use(
    pinoHttp({
      logger,
      redact: ["req.headers.cookie", 'req.headers["x-csrf-token"]', 'res.headers["set-cookie"]'],
      autoLogging: { ignore: (req) => !req.url?.startsWith("/api") },
    }),
  );
  app.use(express.json({ limit: "5mb" }));

  const PgStore = connectPgSimple(session);
  app.use(
    session({
      name: "tenthwise.sid",
      store: new PgStore({ pool: services.pool, tableName: "session", createTableIfMissing: true, pruneSessionInterval: 15 * 60 }),
      secret: services.config.SESSION_SECRET,
      resave: false,
      saveUninitialized: false,
      rolling: true,
      cookie: { httpOnly: true, sameSite: "lax", secure: services.config.COOKIE_SECURE, maxAge: 12 * 60 * 60 * 1000 },
    }),
  );
  const passport = configurePassport(deps);
  app.use(passport.initialize());
  app.use(passport.session());

  // Double-submit: the token lives in the session and comes back in X-CSRF-Token.
  const { csrfSynchronisedProtection, generateToken } = csrfSync({
    getTokenFromRequest: (req) => req.headers["x-csrf-token"] as string | undefined,
  });
  app.use("/api", (req: Request, res: Response, next: NextFunction) => {
    csrfSynchronisedProtection(req, res, (err?: unknown) => next(err ? Errors.csrf() : undefined));
  });

  app.get("/api/health", async (_req, res) => {
    try {
      await services.pool.query("select 1");
      res.json({ ok: true, db: "up" });
    } catch {
      res.status(503).json({ ok: false, db: "down" });
    }
  });
  deps.registry.add({ method: "get", path: "/api/health", summary: "Liveness and database check", tag: "health", permission: "anyone", status: 200 });

  app.use(authRoutes(deps, passport, generateToken));
  for (const make of moduleRouters) app.use(make(deps));

  app.get("/api/openapi.json", (_req, res) => {
    res.json(deps.registry.document({ title: "Tenthwise API", version: "1" }));
  });
  app.use("/api", (req, res) => {
    res.status(404).json({ error: { code: "route_not_found", message: `There is no ${req.method} ${req.originalUrl} in the Tenthwise API.` } });
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
