import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import fs from "node:fs";
import { fileURLToPath } from "node:url";
import { loadConfig } from "./config";
import { runMigrations } from "./db/migrate";
import { prepareDatabase } from "./db/roles";
import { createDb } from "./db/client";
import { systemClock } from "./platform/clock";
import { smtpMailer } from "./platform/mailer";
import { s3Storage } from "./platform/storage";
import { seedDemoOnce } from "./seed";
import { DEMO_PEOPLE } from "./seed/users.seed";

// `npm start` after the shell part: local stand-ins for mail and object storage as child processes,
// the database roles and migrations, the demo seed on first run, then the server. SIGINT/SIGTERM stop
// all of it; so does a crash of this process (an uncaught error here, or the stand-ins noticing that
// their parent is gone: they are tied to it by an IPC channel and stop when it closes).
const here = path.dirname(fileURLToPath(import.meta.url));
const servicesDir = process.env.TENTHWISE_SERVICES_DIR ?? path.resolve(".data");
fs.mkdirSync(servicesDir, { recursive: true });
const children: ChildProcess[] = [];
const say = (line: string) => process.stdout.write(`[tenthwise] ${line}\n`);

/**
 * Starts a stand-in and waits for the ports it bound. Ports are the ones configured, else free ports
 * the system hands out, so two instances side by side never share a mail catcher or an object store.
 */
function startChild(script: string, env: Record<string, string>): Promise<Record<string, number>> {
  // Built: dev-services/*.js beside this file; under `npm run dev` (tsx) the .ts source, with tsx's loader.
  const built = path.join(here, "dev-services", script);
  const file = fs.existsSync(built) ? built : built.replace(/\.js$/, ".ts");
  const child = spawn(process.execPath, [...(file.endsWith(".ts") ? process.execArgv : []), file], {
    env: { ...process.env, ...env, TENTHWISE_SERVICES_DIR: servicesDir },
    stdio: ["ignore", "inherit", "inherit", "ipc"],
  });
  children.push(child);
  return new Promise((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`${script} did not start within 20 s`)), 20_000);
    child.once("message", (m: { ports?: Record<string, number> }) => {
      clearTimeout(timer);
      resolve(m.ports ?? {});
    });
    child.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`${script} stopped (exit code ${code}) before it was ready`));
    });
  });
}

let stopped = false;
function stopChildren() {
  if (stopped) return;
  stopped = true;
  for (const c of children) if (c.exitCode === null) c.kill("SIGTERM");
}

// A crash stops what this process started; it never leaves stand-ins running.
const crash = (what: string) => (err: unknown) => {
  process.stderr.write(`[tenthwise] ${what}: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
  stopChildren();
  process.exit(1);
};
process.on("uncaughtException", crash("unexpected error, stopping"));
process.on("unhandledRejection", crash("unexpected error, stopping"));

/** A port number from the environment, or 0 (a free port). */
const portFrom = (name: string) => String(Number(process.env[name] ?? 0) || 0);

try {
  if (!process.env.SMTP_URL) {
    const ports = await startChild("mail-catcher.cli.js", { MAIL_CATCHER_SMTP_PORT: portFrom("MAIL_CATCHER_SMTP_PORT"), MAIL_CATCHER_HTTP_PORT: portFrom("MAIL_CATCHER_HTTP_PORT") });
    process.env.SMTP_URL = `smtp://127.0.0.1:${ports.smtp}`;
    process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${ports.http}`;
  }
  if (!process.env.S3_ENDPOINT) {
    const ports = await startChild("object-store.cli.js", { OBJECT_STORE_PORT: portFrom("OBJECT_STORE_PORT") });
    process.env.S3_ENDPOINT = `http://127.0.0.1:${ports.http}`;
  }

  // The roles and the database (npm start hands a superuser of its own cluster), else migrations as
  // the owner role someone set up, else as DATABASE_URL's role.
  if (process.env.DATABASE_ADMIN_URL) {
    const urls = await prepareDatabase({
      adminUrl: process.env.DATABASE_ADMIN_URL,
      database: process.env.DATABASE_NAME ?? "tenthwise",
      ownerPassword: process.env.DATABASE_OWNER_PASSWORD,
      runtimePassword: process.env.DATABASE_RUNTIME_PASSWORD,
    });
    process.env.DATABASE_URL = urls.runtimeUrl;
    process.env.DATABASE_OWNER_URL = urls.ownerUrl;
  }
  const config = loadConfig();
  if (!process.env.DATABASE_ADMIN_URL) await runMigrations(config.DATABASE_OWNER_URL ?? config.DATABASE_URL);

  const { pool, db } = createDb(config.DATABASE_URL, 2);
  const password = process.env.DEMO_PASSWORD ?? "tenthwise-demo";
  const seeded = config.SEED_DEMO && await seedDemoOnce(
    {
      db,
      clock: systemClock,
      config,
      mailer: smtpMailer(config.SMTP_URL, config.MAIL_FROM),
      storage: s3Storage({ endpoint: config.S3_ENDPOINT, bucket: config.S3_BUCKET, region: config.S3_REGION, accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY }),
    },
    password,
  );
  await pool.end();
  const { startServer } = await import("./index");
  const running = await startServer();
  const lines = [
    "",
    `Tenthwise is running at ${running.url}`,
    seeded ? "The demo shop (invented data) was seeded." : config.SEED_DEMO ? "Existing data kept (the demo is seeded only on first run)." : "No demo data (SEED_DEMO=false); existing data kept.",
    `Local stand-ins: mail ${config.SMTP_URL} (caught mail: ${process.env.MAIL_CATCHER_URL ?? "—"}), object store ${config.S3_ENDPOINT ?? "—"}`,
    `Demo sign-ins (password ${process.env.DEMO_PASSWORD ? "from DEMO_PASSWORD" : "tenthwise-demo"}):`,
    ...DEMO_PEOPLE.slice(0, 6).map((p) => `  ${p.role.padEnd(10)} ${p.email}`),
    "Press Ctrl-C to stop.",
    "",
  ];
  process.stdout.write(lines.join("\n"));
  let stopping = false;
  const stop = () => {
    // A second signal while stopping ends at once.
    if (stopping) {
      stopChildren();
      process.exit(130);
    }
    stopping = true;
    say("stopping…");
    const hardStop = setTimeout(() => {
      stopChildren();
      process.exit(1);
    }, 8_000);
    hardStop.unref();
    void running
      .stop()
      .catch(() => undefined)
      .finally(() => {
        stopChildren();
        process.exit(0);
      });
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
} catch (e) {
  process.stderr.write(`[tenthwise] ${(e as Error).message}\n`);
  stopChildren();
  process.exit(1);
}
