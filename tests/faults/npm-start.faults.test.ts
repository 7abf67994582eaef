import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { execFileSync, spawn, type ChildProcess } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import request from "supertest";
import { freePort } from "../support/processes";

// `npm start` as a person runs it: it starts PostgreSQL, the mail and object-store stand-ins and the app;
// a crash of the app stops everything it started (stand-ins included) and says "stopping PostgreSQL"
// once; Ctrl-C or SIGTERM stops it all promptly.

interface Instance {
  dataDir: string;
  port: number;
  pgPort: number;
}
let first: Instance;
let second: Instance;
const instance = async (): Promise<Instance> => ({ dataDir: fs.mkdtempSync(path.join(os.tmpdir(), "tw-npm-start-")), port: await freePort(), pgPort: await freePort() });

beforeAll(async () => {
  // The command serves the built server: build it from these sources (esbuild, a few seconds).
  execFileSync("npm", ["run", "--silent", "build:server"], { stdio: "ignore" });
  first = await instance();
  second = await instance();
}, 120_000);

const started: Started[] = [];
afterAll(async () => {
  // A test that failed half-way leaves no npm start behind: SIGTERM is what Ctrl-C would do.
  for (const s of started) {
    if (s.shell.exitCode === null) {
      process.kill(s.shell.pid!, "SIGTERM");
      await Promise.race([s.exited, new Promise((r) => setTimeout(r, 30_000))]);
    }
  }
  for (const i of [first, second]) if (i) fs.rmSync(i.dataDir, { recursive: true, force: true });
}, 120_000);

interface Started {
  shell: ChildProcess;
  output: () => string;
  exited: Promise<number | null>;
}

async function npmStart({ port, pgPort, dataDir }: Instance): Promise<Started> {
  const env: NodeJS.ProcessEnv = { ...process.env, PORT: String(port), PGPORT: String(pgPort), TENTHWISE_DATA_DIR: dataDir, TENTHWISE_SKIP_BUILD: "1", LOG_LEVEL: "warn", SEED_DEMO: "false" };
  for (const k of ["DATABASE_URL", "DATABASE_ADMIN_URL", "DATABASE_OWNER_URL", "SMTP_URL", "S3_ENDPOINT", "MAIL_CATCHER_URL", "NODE_ENV", "SESSION_SECRET"]) delete env[k];
  const shell = spawn("bash", ["scripts/start.sh"], { env, stdio: ["ignore", "pipe", "pipe"], detached: true });
  let out = "";
  shell.stdout!.on("data", (d) => (out += d));
  shell.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<number | null>((resolve) => shell.once("exit", (code) => resolve(code)));
  started.push({ shell, output: () => out, exited });
  for (let i = 0; i < 600 && !out.includes("Press Ctrl-C to stop."); i++) {
    if (shell.exitCode !== null) throw new Error(`npm start stopped:\n${out}`);
    await new Promise((r) => setTimeout(r, 250));
  }
  expect(out, out).toContain("Tenthwise is running at");
  return { shell, output: () => out, exited };
}

const childrenOf = (pid: number) =>
  execFileSync("ps", ["-o", "pid=", "--ppid", String(pid)]).toString().split("\n").map((s) => Number(s.trim())).filter(Boolean);
function alive(pid: number) {
  try {
    process.kill(pid, 0);
    return true;
  } catch {
    return false;
  }
}
async function gone(pids: number[]) {
  for (let i = 0; i < 100 && pids.some(alive); i++) await new Promise((r) => setTimeout(r, 100));
  return pids.filter(alive);
}
const postgresUp = async (pgPort: number) => {
  const net = await import("node:net");
  return new Promise<boolean>((resolve) => {
    const s = net.connect(pgPort, "127.0.0.1", () => (s.end(), resolve(true)));
    s.on("error", () => resolve(false));
  });
};
const times = (text: string, what: string) => text.split(what).length - 1;

describe("npm start", () => {
  it("serves, and when the app crashes it stops the stand-ins and PostgreSQL, saying so once", { timeout: 240_000 }, async () => {
    const s = await npmStart(first);
    expect((await request(`http://127.0.0.1:${first.port}`).get("/api/health")).body).toEqual({ ok: true, db: "up" });
    const [app] = childrenOf(s.shell.pid!).filter((pid) => execFileSync("ps", ["-o", "args=", "-p", String(pid)]).toString().includes("launch.js"));
    expect(app).toBeGreaterThan(0);
    const standIns = childrenOf(app);
    expect(standIns).toHaveLength(2);
    process.kill(app, "SIGKILL");
    await s.exited;
    expect(await gone(standIns)).toEqual([]);
    expect(times(s.output(), "stopping PostgreSQL")).toBe(1);
    expect(await postgresUp(first.pgPort)).toBe(false);
  });

  it("two instances run side by side, each with its own stand-ins, and SIGTERM stops everything each started", { timeout: 300_000 }, async () => {
    const [a, b] = await Promise.all([npmStart(first), npmStart(second)]);
    expect(a.output()).toMatch(/existing data kept/i);
    expect(a.output()).toContain("No demo data (SEED_DEMO=false)");
    const mailOf = (s: Started) => /mail smtp:\/\/127\.0\.0\.1:(\d+)/.exec(s.output())?.[1];
    expect(mailOf(a)).toBeDefined();
    expect(mailOf(a)).not.toBe(mailOf(b));
    for (const i of [first, second]) expect((await request(`http://127.0.0.1:${i.port}`).get("/api/health")).body).toEqual({ ok: true, db: "up" });
    const pids = [a, b].flatMap((s) => {
      const apps = childrenOf(s.shell.pid!);
      return [...apps, ...apps.flatMap(childrenOf)];
    });
    expect(pids).toHaveLength(6);
    for (const s of [a, b]) process.kill(s.shell.pid!, "SIGTERM");
    for (const s of [a, b]) {
      const code = await Promise.race([s.exited, new Promise((r) => setTimeout(() => r("still running"), 30_000))]);
      expect(code).not.toBe("still running");
      expect(times(s.output(), "stopping PostgreSQL")).toBe(1);
    }
    expect(await gone(pids)).toEqual([]);
    expect(await postgresUp(first.pgPort)).toBe(false);
    expect(await postgresUp(second.pgPort)).toBe(false);
  });
});
