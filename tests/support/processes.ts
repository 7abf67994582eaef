import { spawn, type ChildProcess } from "node:child_process";
import net from "node:net";
import fs from "node:fs";
import path from "node:path";
import { build } from "esbuild";

const BUNDLE = path.resolve("node_modules/.cache/tenthwise-tests/app-process.mjs");
let bundled: Promise<void> | null = null;
/** tests/support/app-process.ts bundled once (npm packages stay external): a process then starts in a second, not in tsx's compile time. */
function bundle() {
  bundled ??= (async () => {
    fs.mkdirSync(path.dirname(BUNDLE), { recursive: true });
    await build({ entryPoints: ["tests/support/app-process.ts"], bundle: true, platform: "node", format: "esm", target: "node20", packages: "external", outfile: BUNDLE, logLevel: "warning" });
  })();
  return bundled;
}

/** A free TCP port on loopback. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once("error", reject);
    s.listen(0, "127.0.0.1", () => {
      const port = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(port));
    });
  });
}

export interface AppProcess {
  child: ChildProcess;
  url: string;
  output: () => string;
  /** Ends the process at once, as a crash or a power cut would (no cleanup runs). */
  kill: () => Promise<void>;
  stop: () => Promise<void>;
}

/** Starts tests/support/app-process.ts under tsx with the given environment; resolves once it listens. */
export async function startAppProcess(env: Record<string, string>): Promise<AppProcess> {
  const port = await freePort();
  await bundle();
  const child = spawn(process.execPath, [BUNDLE], {
    env: { ...process.env, NODE_ENV: "test", LOG_LEVEL: "silent", CRON_ENABLED: "false", HOST: "127.0.0.1", PORT: String(port), ...env },
    stdio: ["ignore", "pipe", "pipe"],
  });
  let out = "";
  child.stdout!.on("data", (d) => (out += d));
  child.stderr!.on("data", (d) => (out += d));
  const exited = new Promise<void>((resolve) => child.once("exit", () => resolve()));
  await new Promise<void>((resolve, reject) => {
    const timer = setTimeout(() => reject(new Error(`app process did not start:\n${out}`)), 60_000);
    const check = () => {
      if (out.includes("listening ")) {
        clearTimeout(timer);
        resolve();
      }
    };
    child.stdout!.on("data", check);
    child.once("exit", (code) => {
      clearTimeout(timer);
      reject(new Error(`app process exited (${code}) before listening:\n${out}`));
    });
  });
  return {
    child,
    url: `http://127.0.0.1:${port}`,
    output: () => out,
    kill: async () => {
      child.kill("SIGKILL");
      await exited;
    },
    stop: async () => {
      if (child.exitCode === null) child.kill("SIGTERM");
      await exited;
    },
  };
}
