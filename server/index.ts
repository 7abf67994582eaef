import { loadConfig } from "./config";
import { createDb } from "./db/client";
import { createApp } from "./app";
import { systemClock } from "./platform/clock";
import { smtpMailer } from "./platform/mailer";
import { s3Storage } from "./platform/storage";
import { startSchedules } from "../jobs";
import type { Server } from "node:http";
import { pino } from "pino";

/** How long a stop waits for requests in flight before it closes their connections anyway. */
const STOP_GRACE_MS = 3_000;

/** Builds and starts the HTTP server with the real services; returns a stop function. */
export async function startServer(env: NodeJS.ProcessEnv = process.env) {
  const config = loadConfig(env);
  const logger = pino({ level: config.LOG_LEVEL });
  let lastReported = 0;
  const { pool, db } = createDb(config.DATABASE_URL, {
    max: config.DB_POOL_MAX,
    statementTimeoutMs: config.DB_STATEMENT_TIMEOUT_MS,
    idleInTransactionMs: config.DB_IDLE_IN_TRANSACTION_TIMEOUT_MS,
    lockTimeoutMs: config.DB_LOCK_TIMEOUT_MS,
    idleTimeoutMs: config.DB_IDLE_TIMEOUT_MS,
    // A restart of PostgreSQL ends every idle connection at once: one line, not one per connection.
    onConnectionError: (err) => {
      if (Date.now() - lastReported < 5_000) return;
      lastReported = Date.now();
      logger.warn({ err: { message: err.message, code: (err as { code?: string }).code } }, "database connection lost; new connections are opened as requests come");
    },
  });
  const app = createApp({
    db,
    pool,
    config,
    clock: systemClock,
    logger,
    mailer: smtpMailer(config.SMTP_URL, config.MAIL_FROM),
    storage: s3Storage({
      endpoint: config.S3_ENDPOINT,
      bucket: config.S3_BUCKET,
      region: config.S3_REGION,
      accessKeyId: config.S3_ACCESS_KEY_ID,
      secretAccessKey: config.S3_SECRET_ACCESS_KEY,
    }),
  });
  const stopSchedules = config.CRON_ENABLED ? await startSchedules(app.deps) : () => {};
  const server: Server = await new Promise((resolve, reject) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s));
    s.once("error", reject);
  });
  let stopping: Promise<void> | null = null;
  return {
    app,
    server,
    url: `http://${config.HOST}:${config.PORT}`,
    /**
     * Stops promptly, whatever state the database is in: no new requests, requests in flight get a short
     * grace, then every connection is closed; the pool is ended without waiting on a stuck transaction.
     */
    stop() {
      stopping ??= (async () => {
        stopSchedules();
        const closed = new Promise<void>((resolve) => server.close(() => resolve()));
        server.closeIdleConnections();
        const grace = setTimeout(() => server.closeAllConnections(), STOP_GRACE_MS);
        await closed;
        clearTimeout(grace);
        await Promise.race([pool.end().catch(() => undefined), new Promise((r) => setTimeout(r, STOP_GRACE_MS).unref())]);
      })();
      return stopping;
    },
  };
}
