import { execFileSync } from "node:child_process";
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import { freePort } from "./processes";

/** The newest installed PostgreSQL's programs (Debian's layout). */
export function pgBinDir(): string {
  const root = "/usr/lib/postgresql";
  const v = fs.readdirSync(root).filter((d) => /^\d+$/.test(d)).sort((a, b) => Number(a) - Number(b)).pop();
  if (!v) throw new Error("PostgreSQL is not installed (npm test installs it as root)");
  return path.join(root, v, "bin");
}

const isRoot = process.getuid?.() === 0;
/** PostgreSQL refuses to run as root: as root its programs run as the postgres user. */
function asPg(cmd: string, args: string[]) {
  const [file, argv] = isRoot ? ["runuser", ["-u", "postgres", "--", cmd, ...args]] : [cmd, args];
  return execFileSync(file, argv, { stdio: ["ignore", "pipe", "pipe"] }).toString();
}

/**
 * A PostgreSQL cluster of a test's own, which the test may stop, restart or kill without touching the
 * cluster every other test file shares. Trust authentication on loopback, no fsync: throwaway only.
 */
export async function startOwnCluster() {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), "tw-own-cluster-"));
  fs.chmodSync(dir, 0o755);
  if (isRoot) execFileSync("chown", ["-R", "postgres:postgres", dir]);
  const pgdata = path.join(dir, "pg");
  const bin = pgBinDir();
  asPg(path.join(bin, "initdb"), ["-D", pgdata, "-U", "app", "--auth=trust", "-E", "UTF8", "--locale=C.UTF-8"]);
  const port = await freePort();
  const opts = `-c listen_addresses=127.0.0.1 -p ${port} -k ${pgdata} -c fsync=off -c synchronous_commit=off -c full_page_writes=off`;
  const ctl = (...args: string[]) => asPg(path.join(bin, "pg_ctl"), ["-D", pgdata, ...args]);
  ctl("-l", path.join(pgdata, "server.log"), "-w", "-o", opts, "start");
  return {
    port,
    adminUrl: `postgres://app@127.0.0.1:${port}/postgres`,
    /** A fast restart (active sessions ended with 57P01), as a package upgrade or a failover does. */
    restart: () => ctl("-l", path.join(pgdata, "server.log"), "-m", "fast", "-w", "-o", opts, "restart"),
    stop: () => ctl("-m", "fast", "-w", "stop"),
    start: () => ctl("-l", path.join(pgdata, "server.log"), "-w", "-o", opts, "start"),
    async destroy() {
      try {
        ctl("-m", "immediate", "-w", "stop");
      } catch {
        // already stopped
      }
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
