import { loadConfig } from "./config";
import { createDb } from "./db/client";
import { createApp } from "./app";
import { systemClock } from "./platform/clock";
import { smtpMailer } from "./platform/mailer";
import { s3Storage } from "./platform/storage";
import { startSchedules } from "../jobs";
import type { Server } from "node:http";

/** Builds and starts the HTTP server with the real services; returns a stop function. */
export async function startServer(env: NodeJS.ProcessEnv = process.env) {
  const config = loadConfig(env);
  const { pool, db } = createDb(config.DATABASE_URL);
  const app = createApp({
    db,
    pool,
    config,
    clock: systemClock,
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
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s));
  });
  return {
    app,
    server,
    url: `http://${config.HOST}:${config.PORT}`,
    async stop() {
      stopSchedules();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      await pool.end();
    },
  };
}
