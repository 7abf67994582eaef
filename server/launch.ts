import { spawn, type ChildProcess } from "node:child_process";
import path from "node:path";
import fs from "node:fs";
import { fileURLToPath } from "node:url";
import { loadConfig } from "./config";
import { runMigrations } from "./db/migrate";
import { createDb } from "./db/client";
import { systemClock } from "./platform/clock";
import { smtpMailer } from "./platform/mailer";
import { s3Storage } from "./platform/storage";
import { seedDemoOnce } from "./seed";
import { DEMO_PEOPLE } from "./seed/users.seed";

// `npm start` after the shell part: local stand-ins for mail and object
// storage as child processes, migrations, the demo seed on first run, then
// the server. SIGINT/SIGTERM stop all of it.
const here = path.dirname(fileURLToPath(import.meta.url));
const servicesDir = process.env.TENTHWISE_SERVICES_DIR ?? path.resolve(".data");
fs.mkdirSync(servicesDir, { recursive: true });

const smtpPort = Number(process.env.MAIL_CATCHER_SMTP_PORT ?? 2525);
const mailHttpPort = Number(process.env.MAIL_CATCHER_HTTP_PORT ?? 2526);
const objectPort = Number(process.env.OBJECT_STORE_PORT ?? 4569);
const children: ChildProcess[] = [];

function startChild(script: string, env: Record<string, string>) {
  const child = spawn(process.execPath, [path.join(here, "dev-services", script)], {
    env: { ...process.env, ...env, TENTHWISE_SERVICES_DIR: servicesDir },
    stdio: ["ignore", "inherit", "inherit"],
  });
  children.push(child);
  return child;
}

async function waitForPort(port: number, what: string) {
  const net = await import("node:net");
  for (let i = 0; i < 100; i++) {
    const ok = await new Promise<boolean>((resolve) => {
      const s = net.connect(port, "127.0.0.1", () => (s.end(), resolve(true)));
      s.on("error", () => resolve(false));
    });
    if (ok) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${what} did not start on port ${port}`);
}

if (!process.env.SMTP_URL) {
  startChild("mail-catcher.cli.js", { MAIL_CATCHER_SMTP_PORT: String(smtpPort), MAIL_CATCHER_HTTP_PORT: String(mailHttpPort) });
  process.env.SMTP_URL = `smtp://127.0.0.1:${smtpPort}`;
  process.env.MAIL_CATCHER_URL = `http://127.0.0.1:${mailHttpPort}`;
}
if (!process.env.S3_ENDPOINT) {
  startChild("object-store.cli.js", { OBJECT_STORE_PORT: String(objectPort) });
  process.env.S3_ENDPOINT = `http://127.0.0.1:${objectPort}`;
}

const stopChildren = () => {
  for (const c of children) c.kill("SIGTERM");
};

try {
  const config = loadConfig();
  await Promise.all([
    process.env.MAIL_CATCHER_URL ? waitForPort(smtpPort, "the local mail catcher") : Promise.resolve(),
    children.length ? waitForPort(objectPort, "the local object store").catch(() => undefined) : Promise.resolve(),
  ]);
  await runMigrations(config.DATABASE_URL);
  const { pool, db } = createDb(config.DATABASE_URL, 2);
  const password = process.env.DEMO_PASSWORD ?? "tenthwise-demo";
  const seeded = await seedDemoOnce(
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
    seeded ? "The demo shop (invented data) was seeded." : "Existing data kept (the demo is seeded only on first run).",
    `Demo sign-ins (password ${process.env.DEMO_PASSWORD ? "from DEMO_PASSWORD" : "tenthwise-demo"}):`,
    ...DEMO_PEOPLE.slice(0, 6).map((p) => `  ${p.role.padEnd(10)} ${p.email}`),
    "Press Ctrl-C to stop.",
    "",
  ];
  process.stdout.write(lines.join("\n"));
  const stop = () => {
    void running.stop().finally(() => {
      stopChildren();
      process.exit(0);
    });
  };
  process.on("SIGINT", stop);
  process.on("SIGTERM", stop);
} catch (e) {
  process.stderr.write(`${(e as Error).message}\n`);
  stopChildren();
  process.exit(1);
}
